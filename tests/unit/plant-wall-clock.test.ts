import { describe, expect, it } from 'vitest';
import { formatDateTime, plantWallClockMs } from '../../shared/plant-time';

/**
 * The chart axis helper: the plant's wall clock of an instant, read back as UTC. Offsets from the
 * IANA time zone database; the European summer-time change is at 01:00 UTC on the last Sunday of
 * March (EU Directive 2000/84/EC), so 29 March 2026 in Berlin goes from UTC+1 to UTC+2.
 */
describe('plantWallClockMs', () => {
  it('shifts by the zone offset in force at that instant (Europe/Berlin around the March 2026 change)', () => {
    expect(new Date(plantWallClockMs('2026-03-29T00:30:00Z', 'Europe/Berlin')).toISOString()).toBe('2026-03-29T01:30:00.000Z');
    expect(new Date(plantWallClockMs('2026-03-29T01:30:00Z', 'Europe/Berlin')).toISOString()).toBe('2026-03-29T03:30:00.000Z');
  });

  it('handles a quarter-hour zone (Asia/Kathmandu, UTC+05:45) and UTC itself', () => {
    expect(new Date(plantWallClockMs('2026-12-02T18:20:00Z', 'Asia/Kathmandu')).toISOString()).toBe('2026-12-03T00:05:00.000Z');
    expect(plantWallClockMs('2026-12-02T18:20:00Z', 'UTC')).toBe(Date.parse('2026-12-02T18:20:00Z'));
  });

  it('formatted as UTC, reads the same as the plant-time formatter', () => {
    const at = '2026-07-14T22:10:00Z';
    expect(formatDateTime(plantWallClockMs(at, 'America/Chicago'), 'UTC')).toBe(formatDateTime(at, 'America/Chicago'));
  });
});
