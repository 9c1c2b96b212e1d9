import { describe, expect, it } from 'vitest';
import { containerExpiry, fefoOrder, isExpired, lotExpiry, type ExpiryMaterial } from '../../shared/expiry';
import { parseGs1 } from '../../shared/gs1';

const none: ExpiryMaterial = {
  shelfLifeDays: null,
  openLifeHours: null,
  thawedLifeHours: null,
  outOfStorageAllowanceHours: null,
  potLifeMinutes: null,
  storageClass: 'ambient',
};
const mat = (m: Partial<ExpiryMaterial>): ExpiryMaterial => ({ ...none, ...m });
const at = (iso: string) => new Date(iso);

describe('lot expiry', () => {
  it('supplier expiry wins when earliest and is usable through that day', () => {
    // A date printed on a label is usable through that day (common practice); ASTM D907 "shelf life"
    const r = lotExpiry(mat({ shelfLifeDays: 365 }), {
      receivedAt: '2025-06-10T08:00:00Z',
      manufacturedOn: '2025-06-01',
      expiresOn: '2026-03-31',
    });
    expect(r.cause).toBe('supplier_expiry');
    expect(r.at).toBe('2026-04-01T00:00:00.000Z');
    expect(r.candidates.map((c) => c.cause)).toEqual(['supplier_expiry', 'shelf_life']);
    expect(isExpired(r, at('2026-03-31T23:59:59.999Z'))).toBe(false);
    expect(isExpired(r, at('2026-04-01T00:00:00.000Z'))).toBe(true);
  });

  it("ends the label date at midnight in the plant's zone", () => {
    // IANA tz database / EU Directive 2000/84/EC: summer time from 2026-03-29, so midnight at the
    // start of 2026-04-01 in Berlin is 22:00 UTC the day before (UTC+2).
    const r = lotExpiry(none, { receivedAt: '2025-06-10T08:00:00Z', expiresOn: '2026-03-31' }, 'Europe/Berlin');
    expect(r.at).toBe('2026-03-31T22:00:00.000Z');
    // and in winter (UTC+1)
    expect(lotExpiry(none, { receivedAt: '2025-06-10T08:00:00Z', expiresOn: '2026-01-15' }, 'Europe/Berlin').at).toBe(
      '2026-01-15T23:00:00.000Z',
    );
  });

  it('shelf life wins from the manufacture date, usable for exactly shelfLifeDays days', () => {
    // ASTM D907 "shelf life": how long a packaged adhesive stays usable under stated storage
    const r = lotExpiry(mat({ shelfLifeDays: 30 }), {
      receivedAt: '2025-01-20T09:00:00Z',
      manufacturedOn: '2025-01-01',
      expiresOn: '2025-12-31',
    });
    expect(r).toMatchObject({ cause: 'shelf_life', at: '2025-01-31T00:00:00.000Z' });
  });

  it('counts shelf life from receipt when the manufacture date is unknown', () => {
    const r = lotExpiry(mat({ shelfLifeDays: 10 }), { receivedAt: '2025-03-10T14:30:00Z', manufacturedOn: null });
    expect(r).toMatchObject({ cause: 'shelf_life', at: '2025-03-20T14:30:00.000Z' });
    // Calendar days keep the wall-clock time across a DST change (US DST began 2025-03-09,
    // Energy Policy Act of 2005): 10:00 EST + 10 days = 10:00 EDT = 14:00 UTC.
    const ny = lotExpiry(mat({ shelfLifeDays: 10 }), { receivedAt: '2025-03-01T15:00:00Z' }, 'America/New_York');
    expect(ny.at).toBe('2025-03-11T14:00:00.000Z');
  });

  it('day 00 on a GS1 label becomes the last day of the month, usable through it', () => {
    // GS1 General Specifications: YYMMDD with day 00 = last day of the month
    const now = at('2025-01-10T00:00:00Z');
    const scan = parseGs1('(01)09521234543213(17)250200(10)L-1', now);
    const r = lotExpiry(mat({ shelfLifeDays: 3650 }), { receivedAt: now.toISOString(), expiresOn: scan.expiresOn });
    expect(r).toMatchObject({ cause: 'supplier_expiry', at: '2025-03-01T00:00:00.000Z' });
    expect(isExpired(r, at('2025-02-28T23:59:59Z'))).toBe(false);
    expect(isExpired(r, at('2025-03-01T00:00:00Z'))).toBe(true);
    // leap year: 240200 is 2024-02-29, so expiry is the start of 2024-03-01
    const leap = parseGs1('(17)240200', now);
    expect(lotExpiry(none, { receivedAt: now.toISOString(), expiresOn: leap.expiresOn }).at).toBe('2024-03-01T00:00:00.000Z');
  });

  it('refuses bad dates, zones and negative lives', () => {
    expect(() => lotExpiry(none, { receivedAt: 'yesterday' })).toThrow(RangeError);
    expect(() => lotExpiry(none, { receivedAt: '2025-01-01T00:00:00Z', expiresOn: '2025-02-30' })).toThrow(/calendar/);
    expect(() => lotExpiry(none, { receivedAt: '2025-01-01T00:00:00Z' }, 'Mars/Olympus')).toThrow(/time zone/);
    expect(() => lotExpiry(mat({ shelfLifeDays: -1 }), { receivedAt: '2025-01-01T00:00:00Z' })).toThrow(/shelfLifeDays/);
  });
});

describe('container expiry', () => {
  const lot = { receivedAt: '2025-05-01T08:00:00Z', expiresOn: '2026-05-01' };

  it('after-opening life wins once opened', () => {
    // adhesive makers' storage guidance: an opened cyanoacrylate has a shorter life than a sealed one
    const m = mat({ shelfLifeDays: 300, openLifeHours: 720, storageClass: 'refrigerated' });
    const r = containerExpiry(m, lot, { openedAt: '2025-06-01T10:00:00Z' });
    expect(r).toMatchObject({ cause: 'open_life', at: '2025-07-01T10:00:00.000Z' });
    expect(containerExpiry(m, lot, {}).cause).toBe('shelf_life'); // sealed: no open-life candidate
  });

  it('thawed life wins for frozen material', () => {
    // adhesive makers' storage guidance: frozen premixed epoxy work life counts from the end of the thaw
    const m = mat({ shelfLifeDays: 180, thawedLifeHours: 4, storageClass: 'frozen' });
    const r = containerExpiry(m, lot, { thawedAt: '2025-06-02T06:30:00Z' });
    expect(r).toMatchObject({ cause: 'thawed_life', at: '2025-06-02T10:30:00.000Z' });
  });

  it('counts time out of refrigerated storage against the allowance', () => {
    // common practice: refrigerated adhesives allow a limited cumulative time at room temperature
    const m = mat({ shelfLifeDays: 300, outOfStorageAllowanceHours: 8, storageClass: 'refrigerated' });
    const now = at('2025-06-03T12:00:00Z');
    const out = containerExpiry(m, lot, { outOfStorageMinutes: 300, outOfStorageSince: '2025-06-03T11:00:00Z' }, 'UTC', now);
    expect(out).toMatchObject({ cause: 'out_of_storage', at: '2025-06-03T14:00:00.000Z' }); // 8 h − 5 h = 3 h
    expect(isExpired(out, now)).toBe(false);
    const usedUp = containerExpiry(m, lot, { outOfStorageMinutes: 480 }, 'UTC', now);
    expect(usedUp).toMatchObject({ cause: 'out_of_storage', at: now.toISOString() });
    expect(isExpired(usedUp, now)).toBe(true);
    expect(containerExpiry(m, lot, { outOfStorageMinutes: 100 }, 'UTC', now).cause).toBe('shelf_life');
    // ambient material has no cold storage to leave
    expect(containerExpiry({ ...m, storageClass: 'ambient' }, lot, { outOfStorageMinutes: 9999 }, 'UTC', now).cause).toBe('shelf_life');
  });

  it('ignores rules whose material value is null', () => {
    const r = containerExpiry(none, { receivedAt: '2025-05-01T08:00:00Z' }, { openedAt: '2025-05-02T00:00:00Z', thawedAt: null });
    expect(r).toEqual({ at: null, cause: null, candidates: [] });
    expect(isExpired(r, at('2099-01-01T00:00:00Z'))).toBe(false);
  });
});

describe('fefoOrder', () => {
  it('puts the earliest expiry first, no expiry last, ties by receipt then sequence', () => {
    // first-expiry-first-out (WHO good storage and distribution practices; common practice)
    const items = [
      { id: 'a', expiry: null, receivedAt: '2025-01-01T00:00:00Z', seq: 1 },
      { id: 'b', expiry: '2025-09-01T00:00:00Z', receivedAt: '2025-03-01T00:00:00Z', seq: 2 },
      { id: 'c', expiry: '2025-08-01T00:00:00Z', receivedAt: '2025-04-01T00:00:00Z', seq: 3 },
      { id: 'd', expiry: '2025-09-01T00:00:00Z', receivedAt: '2025-02-01T00:00:00Z', seq: 9 },
      { id: 'e', expiry: '2025-09-01T00:00:00Z', receivedAt: '2025-02-01T00:00:00Z', seq: 4 },
      { id: 'f', expiry: null, receivedAt: '2024-12-01T00:00:00Z', seq: 5 },
    ];
    expect(fefoOrder(items).map((i) => i.id)).toEqual(['c', 'e', 'd', 'b', 'f', 'a']);
    expect(items[0].id).toBe('a'); // input untouched
  });
});
