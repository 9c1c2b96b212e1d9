/**
 * The one way Tacklog shows time to people: in the plant's time zone (TACKLOG_PLANT_ZONE,
 * sent to the client by the server), one date format (2026-12-02), one 24-hour time format
 * (07:25), the day named whenever it is not today ("Thu 07:25", or the date beyond six days),
 * and durations from one helper ("3 h 20 min"). Used by server messages, pages, labels and CSV.
 *
 * Pure: the zone and "now" are always passed in (or default to the present moment), and the
 * output never depends on the machine's own zone or locale: an ISO string without an offset is
 * read as UTC (as the API sends every instant), digits are Latin and day names English.
 */
import { DateTime } from 'luxon';

export const DATE_FORMAT = 'yyyy-MM-dd';
export const TIME_FORMAT = 'HH:mm';
export const DATE_TIME_FORMAT = `${DATE_FORMAT} ${TIME_FORMAT}`;

export type InstantLike = string | Date | number;

/** Whatever the machine's locale is, print Latin digits, Gregorian dates, English day names. */
const FIXED_LOCALE = { locale: 'en-GB', numberingSystem: 'latn', outputCalendar: 'gregory' } as const;

const BARE_DATE = /^\d{4}-\d{2}-\d{2}$/;

function toDateTime(value: InstantLike, zone: string): DateTime {
  const dt =
    typeof value === 'string'
      ? DateTime.fromISO(value, { zone: 'utc', setZone: true }) // no offset given: UTC, never the machine's zone
      : value instanceof Date
        ? DateTime.fromJSDate(value)
        : DateTime.fromMillis(value);
  if (!dt.isValid) throw new RangeError(`not a valid instant: ${String(value)}`);
  const zoned = dt.setZone(zone);
  if (!zoned.isValid) throw new RangeError(`unknown time zone "${zone}"`);
  return zoned.reconfigure(FIXED_LOCALE);
}

function toMillis(value: InstantLike): number {
  return toDateTime(value, 'utc').toMillis();
}

/** True for an IANA zone name luxon (and so every formatter here) understands: 'Europe/Berlin', 'UTC'. */
export function isKnownZone(zone: string): boolean {
  return typeof zone === 'string' && zone.trim() !== '' && DateTime.now().setZone(zone).isValid;
}

/**
 * The calendar date in the plant: 2026-12-02. A calendar date (YYYY-MM-DD, e.g. a supplier's
 * expiry date) has no zone and is returned as it is, after checking it is a real date.
 */
export function formatDate(value: InstantLike, zone: string): string {
  if (typeof value === 'string' && BARE_DATE.test(value)) {
    if (!DateTime.fromISO(value, { zone: 'utc' }).isValid) throw new RangeError(`not a real calendar date: ${value}`);
    return value;
  }
  return toDateTime(value, zone).toFormat(DATE_FORMAT);
}

/** Date and time in the plant, for tables, history and CSV: 2026-12-02 07:25. */
export function formatDateTime(value: InstantLike, zone: string): string {
  return toDateTime(value, zone).toFormat(DATE_TIME_FORMAT);
}

/** Whole plant days from `now`'s day to `value`'s day: 0 today, 1 tomorrow, -1 yesterday. */
export function plantDaysFrom(value: InstantLike, zone: string, now: InstantLike = Date.now()): number {
  const day = toDateTime(value, zone).startOf('day');
  const today = toDateTime(now, zone).startOf('day');
  // Calendar days, so a 23- or 25-hour day at a daylight-saving change still counts as one.
  return Math.round(day.diff(today, 'days').days);
}

/**
 * A time as people read it on the floor: "07:25" today, "Thu 07:25" within six plant days
 * either side, otherwise "2026-12-10 07:25". Days are plant days, not the browser's.
 */
export function formatTime(value: InstantLike, zone: string, now: InstantLike = Date.now()): string {
  const dt = toDateTime(value, zone);
  const days = plantDaysFrom(value, zone, now);
  if (days === 0) return dt.toFormat(TIME_FORMAT);
  if (Math.abs(days) <= 6) return dt.toFormat(`ccc ${TIME_FORMAT}`);
  return dt.toFormat(DATE_TIME_FORMAT);
}

/**
 * A length of time, rounded down so a countdown never promises more than is left:
 * "40 s", "45 min", "3 h 20 min", "27 h", "2 d 3 h", and whole days from a week on ("364 d").
 * Negative values read as positive.
 */
export function formatDuration(milliseconds: number): string {
  if (typeof milliseconds !== 'number' || !Number.isFinite(milliseconds)) {
    throw new RangeError(`not a duration: ${String(milliseconds)}`);
  }
  const totalSeconds = Math.floor(Math.abs(milliseconds) / 1000);
  if (totalSeconds < 60) return `${totalSeconds} s`;
  const totalMinutes = Math.floor(totalSeconds / 60);
  if (totalMinutes < 60) return `${totalMinutes} min`;
  const totalHours = Math.floor(totalMinutes / 60);
  if (totalHours < 48) {
    const m = totalMinutes % 60;
    return m === 0 ? `${totalHours} h` : `${totalHours} h ${m} min`;
  }
  const d = Math.floor(totalHours / 24);
  const h = totalHours % 24;
  return h === 0 || d >= 7 ? `${d} d` : `${d} d ${h} h`;
}

/**
 * "in 3 h 20 min" for a future instant, "3 h 20 min ago" for a past one; within a minute
 * either side "in under a minute" / "just now" (a ticking screen should not count seconds).
 */
export function formatRelative(value: InstantLike, now: InstantLike = Date.now()): string {
  const diff = toMillis(value) - toMillis(now);
  if (Math.abs(diff) < 60_000) return diff > 0 ? 'in under a minute' : 'just now';
  return diff > 0 ? `in ${formatDuration(diff)}` : `${formatDuration(diff)} ago`;
}

/** "Thu 07:25, in 27 h 10 min": a moment and how far it is, for countdowns and gates. */
export function formatWhen(value: InstantLike, zone: string, now: InstantLike = Date.now()): string {
  return `${formatTime(value, zone, now)}, ${formatRelative(value, now)}`;
}

/** Greeting by the plant's hour (not the browser's): morning 05–12, afternoon 12–18, evening 18–23, else "Hello". */
export function plantGreeting(zone: string, now: InstantLike = Date.now()): string {
  const hour = toDateTime(now, zone).hour;
  if (hour >= 5 && hour < 12) return 'Good morning';
  if (hour >= 12 && hour < 18) return 'Good afternoon';
  if (hour >= 18 && hour < 23) return 'Good evening';
  return 'Hello'; // the night shift
}

/** An instant as a `datetime-local` field value in the plant's zone: "2026-12-02T07:25". */
export function toPlantInput(value: InstantLike, zone: string): string {
  return toDateTime(value, zone).toFormat("yyyy-MM-dd'T'HH:mm");
}

/**
 * A `datetime-local` field value ("2026-12-02T07:25") read as plant time, as an ISO instant in
 * UTC; null when it is not a date and time. A wall-clock time skipped by a daylight-saving change
 * moves forward by the gap; one that occurs twice is the earlier (luxon's rule).
 */
export function fromPlantInput(value: string, zone: string): string | null {
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?$/.test(value)) return null;
  const dt = DateTime.fromISO(value, { zone });
  if (!dt.isValid) return null;
  return dt.toUTC().toISO();
}

/**
 * The plant's wall-clock time of an instant as if it were UTC, in milliseconds: for a chart's
 * time axis drawn in UTC (ECharts `useUTC`), so its ticks fall on whole plant hours and days and
 * its labels read plant time whatever the browser's zone. Format such a value with zone 'UTC'.
 * In the hour a daylight-saving change repeats, two instants can share a wall-clock time.
 */
export function plantWallClockMs(value: InstantLike, zone: string): number {
  const dt = toDateTime(value, zone);
  return dt.toMillis() + dt.offset * 60_000;
}
