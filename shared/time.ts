/**
 * Small luxon helpers shared by the time-keeping computations (expiry, cure). Pure; no I/O.
 * Every instant that leaves these modules is an ISO 8601 string in UTC (`…Z`), as the API uses.
 */
import { DateTime } from 'luxon';

/** The API's own form of an instant (UTC, `Z`, up to milliseconds), as Date.prototype.toISOString writes it. */
const UTC_ISO = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(?:\.\d{1,3})?Z$/;

/** Parse an ISO instant (with offset) or throw RangeError naming what it was. */
export function instant(iso: string, what = 'time'): DateTime {
  if (typeof iso !== 'string' || iso === '') throw new RangeError(`${what} is missing`);
  // The common case on the scan path, without luxon's general ISO parser: accepted only when
  // the parsed instant writes back to the same calendar fields (so 2026-02-30 still fails below).
  if (UTC_ISO.test(iso)) {
    const t = Date.parse(iso);
    if (Number.isFinite(t) && new Date(t).toISOString().slice(0, 19) === iso.slice(0, 19)) return DateTime.fromMillis(t, { zone: 'utc' });
  }
  const dt = DateTime.fromISO(iso, { zone: 'utc', setZone: true }); // no offset given: read as UTC
  if (!dt.isValid) throw new RangeError(`${what} "${iso}" is not an ISO 8601 instant`);
  return dt;
}

const knownZones = new Set<string>();

/** Check an IANA zone name ('UTC', 'Europe/Berlin' …) or throw RangeError. Names found valid are remembered. */
export function checkZone(zone: string): string {
  if (knownZones.has(zone)) return zone;
  if (!DateTime.now().setZone(zone).isValid) throw new RangeError(`unknown time zone "${zone}"`);
  knownZones.add(zone);
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
