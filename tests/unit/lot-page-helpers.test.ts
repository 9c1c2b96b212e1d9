import { describe, expect, it } from 'vitest';
import { can } from '../../shared/permissions';
import type { Role } from '../../shared/constants';
import { containerMenu } from '../../src/components/lots/containerActions';
import { actionText, fieldChanges, fieldLabel, valueText } from '../../shared/history-words';

const sealed = { status: 'sealed' as const, thawedAt: null, outOfStorageSince: null };
type MenuArgs = Parameters<typeof containerMenu>;
/** The menu for someone holding `roles`, asking the one permission map as the session does. */
const actions = (c: MenuArgs[0], storageClass: MenuArgs[1], roles: Role[], lotStatus?: MenuArgs[3]) =>
  containerMenu(c, storageClass, (action) => can(roles, action), lotStatus).map((i) => i.action);

describe('container actions offered', () => {
  it('offers opening only for a released lot (on hold and quarantined lots are blocked: ISO 9001 §8.5.2 inspection status)', () => {
    expect(actions(sealed, 'ambient', ['receiving'], 'released')).toContain('open');
    expect(actions(sealed, 'ambient', ['receiving'], 'on_hold')).not.toContain('open');
    expect(actions(sealed, 'ambient', ['receiving'], 'quarantined')).not.toContain('open');
  });

  it('asks for the end of the thaw before a frozen container is opened (common practice for frozen premixed epoxies)', () => {
    expect(actions(sealed, 'frozen', ['assembler'])).toEqual(expect.arrayContaining(['thaw']));
    expect(actions(sealed, 'frozen', ['assembler'])).not.toContain('open');
    expect(actions({ ...sealed, thawedAt: '2026-03-01T08:00:00Z' }, 'frozen', ['assembler'])).toContain('open');
  });

  it('counts time out of cold storage for refrigerated material only', () => {
    expect(actions(sealed, 'refrigerated', ['quality'])).toContain('out-of-storage');
    expect(actions({ ...sealed, outOfStorageSince: '2026-03-01T08:00:00Z' }, 'refrigerated', ['quality'])).toContain('return-to-storage');
    expect(actions(sealed, 'ambient', ['quality'])).not.toContain('out-of-storage');
  });

  it('follows the permission map: purchasing only looks, scrapping is for quality and receiving, emptying is not for receiving', () => {
    expect(actions(sealed, 'ambient', ['receiving'])).not.toContain('empty');
    expect(actions(sealed, 'ambient', ['assembler'])).toContain('empty');
    expect(actions(sealed, 'ambient', ['receiving'])).toContain('scrap');
    expect(actions(sealed, 'ambient', ['purchasing'])).toEqual([]);
    expect(actions(sealed, 'ambient', ['assembler'])).not.toContain('scrap');
    expect(actions(sealed, 'ambient', ['admin'])).toEqual(['reprint']);
    expect(actions({ ...sealed, status: 'empty' }, 'ambient', ['quality'])).toEqual(['reprint']);
  });
});

describe('history lines', () => {
  it('shows old → new for the fields that changed, so earlier values stay visible (21 CFR 11.10(e))', () => {
    expect(fieldChanges({ status: 'on_hold', statusReason: null }, { status: 'quarantined', statusReason: 'Supplier notice' })).toEqual([
      { field: 'status', label: 'Status', from: 'On hold', to: 'Quarantined' },
      { field: 'statusReason', label: 'Reason', from: '—', to: 'Supplier notice' },
    ]);
  });

  it('labels fields, names ids, shows times in plant time and leaves checksums out', () => {
    const certId = '0b5e5c1e-2f55-4d7a-9a41-4b8f3f1f0c11';
    const changes = fieldChanges(
      { certificateId: null, certificateExpiresOn: null },
      { certificateId: certId, certificateExpiresOn: '2027-01-31', filename: 'coa.pdf', sha256: 'ab'.repeat(32) },
      { zone: 'Europe/Berlin', names: { [certId]: 'coa.pdf' } },
    );
    expect(changes).toEqual([
      { field: 'certificateId', label: 'Certificate', from: '—', to: 'coa.pdf' },
      { field: 'certificateExpiresOn', label: 'Certificate valid until', from: '—', to: '2027-01-31' },
    ]);
    // 06:30Z on 2026-03-02 is 07:30 CET (IANA tz database; Intl.DateTimeFormat agrees, see plant-time.test.ts).
    expect(
      fieldChanges(
        { status: 'sealed', openedAt: null },
        { status: 'open', openedAt: '2026-03-02T06:30:00.000Z' },
        { zone: 'Europe/Berlin' },
      ),
    ).toEqual([
      { field: 'status', label: 'Status', from: 'Sealed', to: 'Open' },
      { field: 'openedAt', label: 'Opened', from: '—', to: '2026-03-02 07:30' },
    ]);
    expect(fieldChanges({ outOfStorageMinutes: 0 }, { outOfStorageMinutes: 200 })).toEqual([
      { field: 'outOfStorageMinutes', label: 'Time out of cold storage', from: '0 s', to: '3 h 20 min' },
    ]);
    expect(actionText('container.consume')).toBe('Material used');
    expect(actionText('container.out_of_storage')).toBe('Taken out of cold storage');
    expect(actionText('container.something_new')).toBe('Something new');
    expect(fieldLabel('someNewField')).toBe('Some new field');
    expect(valueText('0b5e5c1e-2f55-4d7a-9a41-4b8f3f1f0c12', { zone: 'UTC', names: {} })).toBe('a record no longer on file');
  });

  it('lists a few facts of a new record instead of every column', () => {
    const changes = fieldChanges(null, { status: 'on_hold', supplierLot: 'E2E-1', containers: [{}, {}, {}], receivedBy: 'x' });
    expect(changes).toEqual([
      { field: 'status', label: 'Status', from: null, to: 'On hold' },
      { field: 'supplierLot', label: 'Supplier lot', from: null, to: 'E2E-1' },
      { field: 'containers', label: 'Containers', from: null, to: '3' },
    ]);
    expect(valueText(null)).toBe('—');
    // Codes in other fields read as words too (an alert's kind and subject, a storage class).
    expect(valueText('lamp_check_due', { zone: 'UTC', field: 'kind' })).toBe('UV lamp radiometer check due');
    expect(valueText('dust_cap', { zone: 'UTC', field: 'kind' })).toBe('Dust cap');
    expect(valueText('step_run', { zone: 'UTC', field: 'subjectType' })).toBe('Step run');
    expect(valueText('refrigerated', { zone: 'UTC', field: 'storageClass' })).toBe('Refrigerated');
    expect(valueText('free text', { zone: 'UTC', field: 'kind' })).toBe('free text');
    // A nested record reads field by field, its instants in plant time (no JSON, no ISO text).
    expect(valueText({ exposureSeconds: 35, irradianceAt: '2026-11-23T08:55:19.103Z' }, { zone: 'UTC' })).toBe(
      'Exposure seconds: 35; Irradiance at: 2026-11-23 08:55',
    );
  });
});
