/**
 * The one way Tacklog shows time to people: in the plant's time zone (TACKLOG_PLANT_ZONE,
 * sent to the client by the server), one date format (2026-12-02), one 24-hour time format
 * (07:25), the day named whenever it is not today ("Thu 07:25", or the date beyond a week),
 * and durations from one helper ("3 h 20 min"). Used by server messages, pages, labels and CSV.
 * Pure: the zone and "now" are always passed in.
 */
import { DateTime } from 'luxon';

export const DATE_FORMAT = 'yyyy-MM-dd';
export const TIME_FORMAT = 'HH:mm';

type InstantLike = string | Date | number;

function toDateTime(value: InstantLike, zone: string): DateTime {
  const dt =
    typeof value === 'string'
      ? DateTime.fromISO(value, { setZone: true })
      : value instanceof Date
        ? DateTime.fromJSDate(value)
        : DateTime.fromMillis(value);
  if (!dt.isValid) throw new RangeError(`not a valid instant: ${String(value)}`);
  const zoned = dt.setZone(zone);
  if (!zoned.isValid) throw new RangeError(`unknown time zone "${zone}"`);
  return zoned;
}

/** The calendar date in the plant: 2026-12-02. A bare YYYY-MM-DD is returned as it is. */
export function formatDate(value: InstantLike, zone: string): string {
  if (typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value)) return value;
  return toDateTime(value, zone).toFormat(DATE_FORMAT);
}

/** Date and time in the plant, for tables, history and CSV: 2026-12-02 07:25. */
export function formatDateTime(value: InstantLike, zone: string): string {
  return toDateTime(value, zone).toFormat(`${DATE_FORMAT} ${TIME_FORMAT}`);
}

/**
 * A time as people read it on the floor: "07:25" today, "Thu 07:25" within six days either
 * side, otherwise "2026-12-10 07:25". Days are plant days.
 */
export function formatTime(value: InstantLike, zone: string, now: InstantLike = Date.now()): string {
  const dt = toDateTime(value, zone);
  const today = toDateTime(now, zone).startOf('day');
  const days = Math.round(dt.startOf('day').diff(today, 'days').days);
  if (days === 0) return dt.toFormat(TIME_FORMAT);
  if (Math.abs(days) <= 6) return dt.setLocale('en-GB').toFormat(`ccc ${TIME_FORMAT}`);
  return dt.toFormat(`${DATE_FORMAT} ${TIME_FORMAT}`);
}

/** A length of time: "40 s", "45 min", "3 h 20 min", "2 d 3 h". Negative values read as positive. */
export function formatDuration(milliseconds: number): string {
  if (!Number.isFinite(milliseconds)) throw new RangeError(`not a duration: ${String(milliseconds)}`);
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
  return h === 0 ? `${d} d` : `${d} d ${h} h`;
}

/** "in 3 h 20 min" for a future instant, "3 h 20 min ago" for a past one. */
export function formatRelative(value: InstantLike, now: InstantLike = Date.now()): string {
  const target = toDateTime(value, 'utc').toMillis();
  const from = toDateTime(now, 'utc').toMillis();
  const diff = target - from;
  return diff >= 0 ? `in ${formatDuration(diff)}` : `${formatDuration(diff)} ago`;
}

/** "Thu 07:25, in 27 h 10 min": a moment and how far it is, for countdowns and gates. */
export function formatWhen(value: InstantLike, zone: string, now: InstantLike = Date.now()): string {
  return `${formatTime(value, zone, now)}, ${formatRelative(value, now)}`;
}

/** Greeting by the plant's hour (not the browser's). */
export function plantGreeting(zone: string, now: InstantLike = Date.now()): string {
  const hour = toDateTime(now, zone).hour;
  if (hour >= 5 && hour < 12) return 'Good morning';
  if (hour >= 12 && hour < 18) return 'Good afternoon';
  if (hour >= 18 && hour < 23) return 'Good evening';
  return 'Hello'; // the night shift
}
