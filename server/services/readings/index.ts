import crypto from 'node:crypto';
import { and, desc, eq, gte, inArray, isNotNull, lte, sql, type SQL } from 'drizzle-orm';
import { db } from '../../db/client';
import { runNamed } from '../../db/named';
import { readings, stations } from '../../db/schema';
import { fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import type { Reading, ReadingInput, ReadingQuery } from '../../../shared/schemas/readings';

export function toReading(r: typeof readings.$inferSelect): Reading {
  return {
    id: r.id,
    area: r.area,
    stationId: r.stationId,
    at: r.at.toISOString(),
    tempC: r.tempC === null ? null : Number(r.tempC),
    rhPct: r.rhPct === null ? null : Number(r.rhPct),
    irradianceMWcm2: r.irradianceMWcm2 === null ? null : Number(r.irradianceMWcm2),
    source: r.source,
    recordedBy: r.recordedBy,
    createdAt: r.createdAt.toISOString(),
  };
}

/**
 * POST /api/readings: one or many shop-condition readings, each with its audit row, in one
 * statement (atomic on its own): ids and times are made here, so the answer and the audit rows
 * are known before the insert and nothing needs reading back.
 */
export async function recordReadings(actor: Actor, items: ReadingInput[], options: { single?: boolean } = {}): Promise<Reading[]> {
  requirePermission(actor, 'readings.record');
  await checkStations(items, options.single ?? items.length === 1);
  const createdAt = new Date().toISOString();
  const out: Reading[] = items.map((r) => ({
    id: crypto.randomUUID(),
    area: r.area ?? null,
    stationId: r.stationId ?? null,
    at: new Date(r.at).toISOString(),
    tempC: r.tempC === undefined || r.tempC === null ? null : Number(r.tempC.toFixed(2)),
    rhPct: r.rhPct === undefined || r.rhPct === null ? null : Number(r.rhPct.toFixed(2)),
    irradianceMWcm2: r.irradianceMWcm2 === undefined || r.irradianceMWcm2 === null ? null : Number(r.irradianceMWcm2.toFixed(2)),
    source: r.source ?? 'manual',
    recordedBy: actor.id,
    createdAt,
  }));
  const input = JSON.stringify(
    out.map((r) => ({
      id: r.id,
      area: r.area,
      station_id: r.stationId,
      at: r.at,
      temp_c: r.tempC,
      rh_pct: r.rhPct,
      irradiance: r.irradianceMWcm2,
      source: r.source,
      audit_after: r,
    })),
  );
  await runNamed(
    db,
    'readings_record',
    sql`
    WITH input AS (
      SELECT * FROM json_to_recordset(${input}::json)
        AS t(id uuid, area text, station_id uuid, at timestamptz, temp_c numeric, rh_pct numeric, irradiance numeric, source text, audit_after jsonb)
    ),
    saved AS (
      INSERT INTO readings (id, area, station_id, at, temp_c, rh_pct, irradiance_mw_cm2, source, recorded_by, created_at)
      SELECT id, area, station_id, at, temp_c, rh_pct, irradiance, source, ${actor.id}::uuid, ${createdAt}::timestamptz FROM input
      RETURNING id
    )
    INSERT INTO audit_log (actor_id, action, entity_type, entity_id, after)
    SELECT ${actor.id}::uuid, 'reading.record', 'reading', s.id::text, i.audit_after
    FROM saved s JOIN input i ON i.id = s.id`,
  );
  return out;
}

/** The list's filters, shared by GET /api/readings and its CSV. */
export function readingsWhere(query: Pick<ReadingQuery, 'area' | 'stationId' | 'measure' | 'from' | 'to'>): SQL | undefined {
  return and(
    query.area ? eq(readings.area, query.area) : undefined,
    query.stationId ? eq(readings.stationId, query.stationId) : undefined,
    query.measure === 'irradiance' ? isNotNull(readings.irradianceMWcm2) : undefined,
    query.measure === 'temperature' ? isNotNull(readings.tempC) : undefined,
    query.from ? gte(readings.at, new Date(query.from)) : undefined,
    query.to ? lte(readings.at, new Date(query.to)) : undefined,
  );
}

/** Newest first; the id breaks ties so that paging through the same snapshot is stable. */
export const READINGS_ORDER = [desc(readings.at), desc(readings.createdAt), desc(readings.id)];

/**
 * A station's own readings must name a station Tacklog knows: a 400 naming the field (`stationId`,
 * or `readings.N.stationId` in a list) rather than the foreign key's refusal. Area readings (the
 * logger's bulk) need no look-up.
 */
async function checkStations(items: ReadingInput[], single: boolean): Promise<void> {
  const ids = [...new Set(items.flatMap((r) => (r.stationId ? [r.stationId] : [])))];
  if (ids.length === 0) return;
  const known = new Set((await db.select({ id: stations.id }).from(stations).where(inArray(stations.id, ids))).map((r) => r.id));
  const i = items.findIndex((r) => r.stationId && !known.has(r.stationId));
  if (i >= 0) throw fieldError(single ? 'stationId' : `readings.${i}.stationId`, 'is not a station in Tacklog');
}

/** GET /api/readings: newest first. */
export async function listReadings(query: ReadingQuery): Promise<{ items: Reading[] }> {
  const rows = await db
    .select()
    .from(readings)
    .where(readingsWhere(query))
    .orderBy(...READINGS_ORDER)
    .limit(query.limit);
  return { items: rows.map(toReading) };
}

export { exportReadingsCsv } from './export';
