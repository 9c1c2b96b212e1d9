import { and, asc, desc, eq, gt, gte, isNotNull, lte } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { readings } from '../../db/schema';
import type { CureProfile, Reading } from '../../../shared/cure';

/** A reading older than this no longer tells the temperature in force (mixing, cure start). */
export const AREA_READING_MAX_AGE_HOURS = 4;

export interface TemperatureAt {
  tempC: number;
  source: 'reading' | 'reference';
  readingAt: string | null;
}

/** The latest reading for the area at or before `at` and not older than the limit, if any. */
export async function readingInForce(tx: DbOrTx, area: string, at: Date): Promise<{ at: Date; tempC: number } | null> {
  const oldest = new Date(at.getTime() - AREA_READING_MAX_AGE_HOURS * 3_600_000);
  const [row] = await tx
    .select({ at: readings.at, tempC: readings.tempC })
    .from(readings)
    .where(and(eq(readings.area, area), isNotNull(readings.tempC), lte(readings.at, at), gte(readings.at, oldest)))
    .orderBy(desc(readings.at), desc(readings.createdAt))
    .limit(1);
  return row ? { at: row.at, tempC: Number(row.tempC) } : null;
}

/** Temperature at an instant: the reading in force, else the profile's reference temperature. */
export async function temperatureAt(tx: DbOrTx, area: string, at: Date, refTempC: number): Promise<TemperatureAt> {
  const r = await readingInForce(tx, area, at);
  return r
    ? { tempC: r.tempC, source: 'reading', readingAt: r.at.toISOString() }
    : { tempC: refTempC, source: 'reference', readingAt: null };
}

/**
 * Temperature histories from `start` on, one per cure profile, for integrating a cure: the
 * reading in force at the start (or, when there is none, the profile's reference temperature),
 * then every later reading of the area. After the last reading its temperature holds (shared/cure.ts).
 */
export async function historiesFor(tx: DbOrTx, area: string, start: Date, profiles: CureProfile[]): Promise<Reading[][]> {
  if (profiles.length === 0) return [];
  const inForce = await readingInForce(tx, area, start);
  const later = await tx
    .select({ at: readings.at, tempC: readings.tempC })
    .from(readings)
    .where(and(eq(readings.area, area), isNotNull(readings.tempC), gt(readings.at, start)))
    .orderBy(asc(readings.at), asc(readings.createdAt));
  const tail = later.map((r) => ({ at: r.at.toISOString(), tempC: Number(r.tempC) }));
  return profiles.map((p) => [{ at: start.toISOString(), tempC: inForce ? inForce.tempC : p.refTempC }, ...tail]);
}

/**
 * Temperature history of a station with its own environment (an oven) from `start` on: its
 * reading in force at the start (not older than the limit), then every later one. With no
 * reading at the start the cure counts from the first later reading; with none at all, null:
 * an oven's cure is never assumed from the room or the data sheet.
 */
export async function stationHistoriesFor(tx: DbOrTx, stationId: string, start: Date, count: number): Promise<(Reading[] | null)[]> {
  const oldest = new Date(start.getTime() - AREA_READING_MAX_AGE_HOURS * 3_600_000);
  const rows = await tx
    .select({ at: readings.at, tempC: readings.tempC })
    .from(readings)
    .where(and(eq(readings.stationId, stationId), isNotNull(readings.tempC), gte(readings.at, oldest)))
    .orderBy(asc(readings.at), asc(readings.createdAt));
  const inForce = rows.filter((r) => r.at <= start).at(-1);
  const tail = rows.filter((r) => r.at > start).map((r) => ({ at: r.at.toISOString(), tempC: Number(r.tempC) }));
  let history: Reading[] | null;
  if (inForce) history = [{ at: start.toISOString(), tempC: Number(inForce.tempC) }, ...tail];
  else history = tail.length ? tail : null;
  return Array.from({ length: count }, () => history);
}
