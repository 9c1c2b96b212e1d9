import { DateTime } from 'luxon';
import { config } from '../../config';

/** The plant day holding `now`: [00:00, next 00:00) in the plant's zone (23 or 25 hours on a DST change day). */
export function plantDay(now: Date, zone: string = config.plantZone): { date: string; start: Date; end: Date } {
  const start = DateTime.fromJSDate(now, { zone }).startOf('day');
  return { date: start.toISODate()!, start: start.toJSDate(), end: start.plus({ days: 1 }).toJSDate() };
}
