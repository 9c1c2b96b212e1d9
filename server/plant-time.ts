/**
 * The shared plant-time formatter (shared/plant-time.ts) bound to the plant's zone
 * (TACKLOG_PLANT_ZONE), for every time the server writes for people: refusal and alert
 * messages, labels, CSV exports, e-mail.
 */
import { config } from './config';
import { formatDate, formatDateTime, formatDuration, formatTime, type InstantLike } from '../shared/plant-time';

/** "07:25" today (in the plant), "Thu 07:25" within six days, else "2026-12-10 07:25". */
export function plantTime(value: InstantLike, now: InstantLike = Date.now()): string {
  return formatTime(value, config.plantZone, now);
}

/** "2026-12-02 07:25" in the plant: for text that is read later (alerts, history, CSV, labels). */
export function plantDateTime(value: InstantLike): string {
  return formatDateTime(value, config.plantZone);
}

/** "2026-12-02": the plant's calendar date of an instant (a bare date is returned as it is). */
export function plantDate(value: InstantLike): string {
  return formatDate(value, config.plantZone);
}

export { formatDuration };
