import { afterEach, describe, expect, it, vi } from 'vitest';
import {
  formatDate,
  formatDateTime,
  formatDuration,
  formatRelative,
  formatTime,
  formatWhen,
  isKnownZone,
  plantDaysFrom,
  plantGreeting,
} from '../../shared/plant-time';

/**
 * Independent reference: ECMA-402 Intl.DateTimeFormat (Node's ICU with the IANA time zone
 * database), asked for the wall-clock parts of an instant in a zone. Our formatter uses luxon;
 * the two must agree on every instant below.
 */
function intlWallClock(iso: string, zone: string): { date: string; time: string; weekday: string } {
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone: zone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    weekday: 'short',
    hourCycle: 'h23',
  }).formatToParts(new Date(iso));
  const p = (type: string) => parts.find((x) => x.type === type)!.value;
  return { date: `${p('year')}-${p('month')}-${p('day')}`, time: `${p('hour')}:${p('minute')}`, weekday: p('weekday') };
}

const BERLIN = 'Europe/Berlin';
const NEW_YORK = 'America/New_York';

describe('plant time: instants in two zones, across daylight-saving changes', () => {
  // IANA tz database (EU rule, Directive 2000/84/EC): Europe/Berlin leaves summer time on the
  // last Sunday of October at 01:00 UTC. On 2026-10-25, 00:30Z is 02:30 CEST and 01:30Z is
  // 02:30 CET: the same wall-clock time twice, one hour apart.
  it('Europe/Berlin on 2026-10-25: 00:30Z and 01:30Z both read 02:30 (CEST, then CET)', () => {
    const now = '2026-10-25T09:00:00Z';
    expect(formatTime('2026-10-25T00:30:00Z', BERLIN, now)).toBe('02:30');
    expect(formatTime('2026-10-25T01:30:00Z', BERLIN, now)).toBe('02:30');
    expect(formatDateTime('2026-10-25T00:30:00Z', BERLIN)).toBe('2026-10-25 02:30');
    expect(formatDateTime('2026-10-25T01:30:00Z', BERLIN)).toBe('2026-10-25 02:30');
    // The hour before and after the change.
    expect(formatDateTime('2026-10-24T23:59:00Z', BERLIN)).toBe('2026-10-25 01:59');
    expect(formatDateTime('2026-10-25T02:00:00Z', BERLIN)).toBe('2026-10-25 03:00');
  });

  // IANA tz database (EU rule): summer time starts the last Sunday of March at 01:00 UTC; 02:00–02:59 does not exist.
  it('Europe/Berlin on 2026-03-29: 00:59Z is 01:59 CET, 01:00Z is 03:00 CEST', () => {
    expect(formatDateTime('2026-03-29T00:59:00Z', BERLIN)).toBe('2026-03-29 01:59');
    expect(formatDateTime('2026-03-29T01:00:00Z', BERLIN)).toBe('2026-03-29 03:00');
  });

  // IANA tz database (US rule, Energy Policy Act of 2005): summer time ends the first Sunday of
  // November at 02:00 local, i.e. 2026-11-01 06:00 UTC; 05:30Z is 01:30 EDT and 06:30Z is 01:30 EST.
  it('America/New_York on 2026-11-01: 05:30Z and 06:30Z both read 01:30', () => {
    expect(formatDateTime('2026-11-01T05:30:00Z', NEW_YORK)).toBe('2026-11-01 01:30');
    expect(formatDateTime('2026-11-01T06:30:00Z', NEW_YORK)).toBe('2026-11-01 01:30');
    // Late evening in New York is already the next day in UTC.
    expect(formatDate('2026-12-03T03:10:00Z', NEW_YORK)).toBe('2026-12-02');
    expect(formatDate('2026-12-03T03:10:00Z', 'UTC')).toBe('2026-12-03');
  });

  const instants = [
    '2026-01-15T12:00:00Z',
    '2026-03-29T00:30:00Z',
    '2026-03-29T01:30:00Z',
    '2026-06-30T22:15:00Z',
    '2026-10-25T00:30:00Z',
    '2026-10-25T01:00:00Z',
    '2026-10-25T01:30:00Z',
    '2026-11-01T05:30:00Z',
    '2026-11-01T06:30:00Z',
    '2026-12-02T17:31:00Z',
    '2028-02-29T23:45:00Z',
  ];
  for (const zone of [BERLIN, NEW_YORK, 'UTC', 'Asia/Kolkata']) {
    it(`agrees with Intl.DateTimeFormat (ECMA-402 reference) in ${zone}`, () => {
      for (const iso of instants) {
        const ref = intlWallClock(iso, zone);
        expect(formatDateTime(iso, zone), iso).toBe(`${ref.date} ${ref.time}`);
        expect(formatDate(iso, zone), iso).toBe(ref.date);
        // Two days later the time is named by its weekday, as Intl names it.
        const now = new Date(Date.parse(iso) + 2 * 86_400_000).toISOString();
        expect(formatTime(iso, zone, now), iso).toBe(`${ref.weekday} ${ref.time}`);
      }
    });
  }
});

describe('plant time: the day named whenever it is not today', () => {
  const now = '2026-12-02T10:00:00Z'; // Wednesday 2 December, 11:00 in Berlin
  it('today is the time alone; other days within six days carry the weekday; further ones the date', () => {
    expect(formatTime('2026-12-02T06:25:00Z', BERLIN, now)).toBe('07:25');
    expect(formatTime('2026-12-03T06:25:00Z', BERLIN, now)).toBe('Thu 07:25');
    expect(formatTime('2026-12-01T06:25:00Z', BERLIN, now)).toBe('Tue 07:25');
    expect(formatTime('2026-12-08T06:25:00Z', BERLIN, now)).toBe('Tue 07:25');
    expect(formatTime('2026-12-09T06:25:00Z', BERLIN, now)).toBe('2026-12-09 07:25');
    expect(formatTime('2026-11-25T06:25:00Z', BERLIN, now)).toBe('2026-11-25 07:25');
  });

  it('"today" is the plant\'s day, not UTC\'s: 23:30Z is already tomorrow in Berlin', () => {
    expect(formatTime('2026-12-02T23:30:00Z', 'UTC', now)).toBe('23:30');
    expect(formatTime('2026-12-02T23:30:00Z', BERLIN, now)).toBe('Thu 00:30');
    expect(plantDaysFrom('2026-12-02T23:30:00Z', BERLIN, now)).toBe(1);
    expect(plantDaysFrom('2026-12-02T23:30:00Z', 'UTC', now)).toBe(0);
  });

  it('a 25-hour day at the autumn change still counts as one day', () => {
    // Saturday 2026-10-24 12:00 Berlin → Sunday 23:30 Berlin (25-hour Sunday).
    expect(plantDaysFrom('2026-10-25T22:30:00Z', BERLIN, '2026-10-24T10:00:00Z')).toBe(1);
    expect(formatTime('2026-10-25T22:30:00Z', BERLIN, '2026-10-24T10:00:00Z')).toBe('Sun 23:30');
  });

  it('the weekday stays English with Latin digits whatever the machine locale', () => {
    // Date objects and epoch milliseconds are the same instant as the ISO string.
    expect(formatTime(new Date('2026-12-03T06:25:00Z'), BERLIN, Date.parse(now))).toBe('Thu 07:25');
    expect(formatTime(Date.parse('2026-12-03T06:25:00Z'), BERLIN, new Date(now))).toBe('Thu 07:25');
  });
});

describe('plant time: durations and countdowns', () => {
  const MIN = 60_000;
  const H = 60 * MIN;
  it('formatDuration rounds down and picks the unit', () => {
    expect(formatDuration(0)).toBe('0 s');
    expect(formatDuration(40_999)).toBe('40 s');
    expect(formatDuration(59_999)).toBe('59 s');
    expect(formatDuration(MIN)).toBe('1 min');
    expect(formatDuration(45 * MIN + 59_000)).toBe('45 min');
    expect(formatDuration(3 * H)).toBe('3 h');
    expect(formatDuration(3 * H + 20 * MIN + 30_000)).toBe('3 h 20 min');
    expect(formatDuration(27 * H + 10 * MIN)).toBe('27 h 10 min');
    expect(formatDuration(48 * H)).toBe('2 d');
    expect(formatDuration(51 * H + 59 * MIN)).toBe('2 d 3 h');
    expect(formatDuration(6 * 24 * H + 23 * H)).toBe('6 d 23 h');
    expect(formatDuration(364 * 24 * H + 23 * H)).toBe('364 d');
    expect(formatDuration(-(3 * H + 20 * MIN))).toBe('3 h 20 min');
    expect(() => formatDuration(Number.NaN)).toThrow(RangeError);
  });

  it('formatRelative says which way', () => {
    const now = '2026-12-02T10:00:00Z';
    expect(formatRelative('2026-12-02T13:20:00Z', now)).toBe('in 3 h 20 min');
    expect(formatRelative('2026-12-02T06:40:00Z', now)).toBe('3 h 20 min ago');
    expect(formatRelative('2026-12-02T10:00:30Z', now)).toBe('in under a minute');
    expect(formatRelative('2026-12-02T09:59:30Z', now)).toBe('just now');
    expect(formatRelative('2026-12-02T10:00:00Z', now)).toBe('just now');
  });

  it('formatWhen joins the plant time and the countdown', () => {
    // Worked example: 2026-12-02 17:00 CET to Thursday 07:25 CET is 14 h 25 min.
    expect(formatWhen('2026-12-03T06:25:00Z', BERLIN, '2026-12-02T16:00:00Z')).toBe('Thu 07:25, in 14 h 25 min');
  });
});

describe('plant time: greeting and input checks', () => {
  it('greets by the plant hour, not the machine hour', () => {
    // 03:55 in the plant is night: not "Good evening".
    expect(plantGreeting(BERLIN, '2026-12-02T02:55:00Z')).toBe('Hello');
    expect(plantGreeting(BERLIN, '2026-12-02T04:00:00Z')).toBe('Good morning'); // 05:00 CET
    expect(plantGreeting(NEW_YORK, '2026-12-02T04:00:00Z')).toBe('Hello'); // 23:00 EST
    expect(plantGreeting(BERLIN, '2026-12-02T11:00:00Z')).toBe('Good afternoon');
    expect(plantGreeting(BERLIN, '2026-12-02T17:00:00Z')).toBe('Good evening');
  });

  it('refuses an unknown zone and a malformed instant, and keeps calendar dates as they are', () => {
    expect(isKnownZone(BERLIN)).toBe(true);
    expect(isKnownZone('UTC')).toBe(true);
    expect(isKnownZone('Mars/Olympus')).toBe(false);
    expect(isKnownZone('')).toBe(false);
    expect(() => formatDateTime('2026-12-02T10:00:00Z', 'Mars/Olympus')).toThrow(/time zone/);
    expect(() => formatDateTime('yesterday', BERLIN)).toThrow(RangeError);
    expect(formatDate('2026-03-31', NEW_YORK)).toBe('2026-03-31');
    expect(() => formatDate('2026-02-30', BERLIN)).toThrow(RangeError);
  });

  describe('the machine zone never leaks', () => {
    afterEach(() => {
      vi.unstubAllEnvs();
    });
    it('an ISO string without an offset is UTC, even on a machine set to UTC+14', () => {
      vi.stubEnv('TZ', 'Pacific/Kiritimati');
      expect(formatDateTime('2026-12-02T10:00:00', BERLIN)).toBe('2026-12-02 11:00');
      expect(formatDateTime('2026-12-02T10:00:00Z', 'UTC')).toBe('2026-12-02 10:00');
      expect(plantGreeting('UTC', '2026-12-02T10:00:00Z')).toBe('Good morning');
    });
  });
});
