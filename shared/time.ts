/**
 * Small luxon helpers shared by the time-keeping computations (expiry, cure). Pure; no I/O.
 * Every instant that leaves these modules is an ISO 8601 string in UTC (`…Z`), as the API uses.
 */
import { DateTime } from 'luxon';

/** Parse an ISO instant (with offset) or throw RangeError naming what it was. */
export function instant(iso: string, what = 'time'): DateTime {
  if (typeof iso !== 'string' || iso === '') throw new RangeError(`${what} is missing`);
  const dt = DateTime.fromISO(iso, { zone: 'utc', setZone: true }); // no offset given: read as UTC
  if (!dt.isValid) throw new RangeError(`${what} "${iso}" is not an ISO 8601 instant`);
  return dt;
}

/** Check an IANA zone name ('UTC', 'Europe/Berlin' …) or throw RangeError. */
export function checkZone(zone: string): string {
  if (!DateTime.now().setZone(zone).isValid) throw new RangeError(`unknown time zone "${zone}"`);
  return zone;
}

/** Start of a calendar date (YYYY-MM-DD) in a zone; RangeError for a date that does not exist. */
export function startOfDate(date: string, zone: string, what = 'date'): DateTime {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new RangeError(`${what} "${date}" must be YYYY-MM-DD`);
  const dt = DateTime.fromISO(date, { zone: checkZone(zone) });
  if (!dt.isValid) throw new RangeError(`${what} "${date}" is not a real calendar date`);
  return dt.startOf('day');
}

/** ISO instant in UTC with milliseconds, e.g. 2026-01-01T00:00:00.000Z. */
export function toIso(dt: DateTime): string {
  return dt.toUTC().toISO()!;
}

/** Milliseconds since the epoch of an ISO instant. */
export function ms(iso: string, what = 'time'): number {
  return instant(iso, what).toMillis();
}

/** Throw RangeError unless n is a finite number ≥ 0. */
export function nonNegative(n: number, what: string): number {
  if (typeof n !== 'number' || !Number.isFinite(n) || n < 0) {
    throw new RangeError(`${what} must be a finite number of at least 0, got ${String(n)}`);
  }
  return n;
}
