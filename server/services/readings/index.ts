import { and, desc, eq, gte, lte } from 'drizzle-orm';
import { db } from '../../db/client';
import { readings } from '../../db/schema';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { Reading, ReadingInput, ReadingQuery } from '../../../shared/schemas/readings';

function toReading(r: typeof readings.$inferSelect): Reading {
  return {
    id: r.id,
    area: r.area,
    at: r.at.toISOString(),
    tempC: Number(r.tempC),
    rhPct: r.rhPct === null ? null : Number(r.rhPct),
    source: r.source,
    recordedBy: r.recordedBy,
    createdAt: r.createdAt.toISOString(),
  };
}

/** POST /api/readings: one or many shop-condition readings. */
export async function recordReadings(actor: Actor, items: ReadingInput[]): Promise<Reading[]> {
  requirePermission(actor, 'readings.record');
  return db.transaction(async (tx) => {
    const rows = await tx
      .insert(readings)
      .values(
        items.map((r) => ({
          area: r.area,
          at: new Date(r.at),
          tempC: r.tempC.toFixed(2),
          rhPct: r.rhPct === undefined || r.rhPct === null ? null : r.rhPct.toFixed(2),
          source: r.source ?? 'manual',
          recordedBy: actor.id,
        })),
      )
      .returning();
    const out = rows.map(toReading);
    for (const r of out) {
      await recordAudit(tx, { actorId: actor.id, action: 'reading.record', entityType: 'reading', entityId: r.id, after: r });
    }
    return out;
  });
}

/** GET /api/readings: newest first. */
export async function listReadings(query: ReadingQuery): Promise<{ items: Reading[] }> {
  const rows = await db
    .select()
    .from(readings)
    .where(
      and(
        query.area ? eq(readings.area, query.area) : undefined,
        query.from ? gte(readings.at, new Date(query.from)) : undefined,
        query.to ? lte(readings.at, new Date(query.to)) : undefined,
      ),
    )
    .orderBy(desc(readings.at), desc(readings.createdAt))
    .limit(query.limit);
  return { items: rows.map(toReading) };
}
