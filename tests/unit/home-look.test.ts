import { describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { auditStatus, batchStatus, onHoldStatus, timeLeft } from '@/components/home/homeLook';
import { plantDay } from '../../server/services/home/day';

const NOW = Date.parse('2026-12-02T08:00:00Z');
const HOUR = 3_600_000;

describe('home page statuses: a word, an icon and a colour', () => {
  it('lots on hold: nothing waiting, or how long the oldest has waited', () => {
    expect(onHoldStatus({ count: 0, oldestReceivedAt: null, oldestLotId: null }, NOW)).toMatchObject({
      label: 'Nothing awaits inspection',
      color: 'positive',
    });
    const waiting = onHoldStatus({ count: 2, oldestReceivedAt: new Date(NOW - 50 * HOUR).toISOString(), oldestLotId: null }, NOW);
    expect(waiting).toMatchObject({ label: 'Oldest waiting 2 d 2 h', color: 'warning' });
  });

  it('the audit chain: not verified, intact, or broken at the entry named', () => {
    expect(auditStatus(null).label).toBe('Not verified yet');
    expect(auditStatus({ at: '2026-12-02T03:00:00.000Z', ok: true, checked: 10, firstBroken: null })).toMatchObject({
      label: 'Intact',
      color: 'positive',
    });
    const broken = auditStatus({
      at: '2026-12-02T03:00:00.000Z',
      ok: false,
      checked: 4,
      firstBroken: { id: 5, at: '2026-12-01T03:00:00.000Z', problem: 'x' },
    });
    expect(broken).toMatchObject({ label: 'Broken at entry 5', color: 'negative' });
  });

  it('the batch at my station: running, loaded, curing, cured', () => {
    const base = {
      id: 'b',
      code: 'B-1',
      modelCode: 'M',
      quantity: 10,
      step: null,
      since: new Date(NOW - HOUR).toISOString(),
      loadedCount: 0,
    };
    expect(batchStatus({ ...base, state: 'running', cureCompleteAt: null }, NOW).label).toBe('Step running');
    expect(batchStatus({ ...base, state: 'loaded', cureCompleteAt: null }, NOW).label).toBe('Loaded, step not started');
    expect(batchStatus({ ...base, state: 'finished', cureCompleteAt: new Date(NOW + HOUR).toISOString() }, NOW).label).toBe(
      'Finished, curing',
    );
    expect(batchStatus({ ...base, state: 'finished', cureCompleteAt: new Date(NOW - HOUR).toISOString() }, NOW).label).toBe(
      'Finished and cured',
    );
    expect(batchStatus({ ...base, state: 'finished', cureCompleteAt: null }, NOW).label).toBe('Finished');
    expect(timeLeft(new Date(NOW + 80 * 60_000).toISOString(), NOW)).toBe('1 h 20 min left');
    expect(timeLeft(new Date(NOW - 60_000).toISOString(), NOW)).toBe('due now');
  });
});

describe('the plant day of the home figures', () => {
  it('runs from midnight to midnight in the plant zone, 25 hours on the day summer time ends', () => {
    // IANA tz database, EU rule: summer time ends on the last Sunday of October at 01:00 UTC
    // (2026-10-25), so that day in Europe/Berlin lasts 25 hours.
    const day = plantDay(new Date('2026-10-25T12:00:00Z'), 'Europe/Berlin');
    expect(day.date).toBe('2026-10-25');
    expect(day.start.toISOString()).toBe('2026-10-24T22:00:00.000Z'); // 00:00 CEST (UTC+2)
    expect(day.end.toISOString()).toBe('2026-10-25T23:00:00.000Z'); // 00:00 CET (UTC+1) next day
    expect((day.end.getTime() - day.start.getTime()) / HOUR).toBe(25);
  });

  it('an instant just before the plant midnight belongs to the day before', () => {
    const midnight = DateTime.fromISO('2026-12-02T00:00', { zone: 'Pacific/Auckland' }).toJSDate();
    expect(plantDay(new Date(midnight.getTime() - 1), 'Pacific/Auckland').date).toBe('2026-12-01');
    expect(plantDay(midnight, 'Pacific/Auckland').date).toBe('2026-12-02');
    expect(plantDay(midnight, 'Pacific/Auckland').start.toISOString()).toBe('2026-12-01T11:00:00.000Z'); // NZDT is UTC+13
  });
});
