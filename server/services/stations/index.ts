import { and, asc, eq, isNull, ne } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { stationLoads, stations } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { auditUnloads } from '../loading/unload-audit';
import type { Station, StationInput, StationListQuery, StationPatch } from '../../../shared/schemas/stations';

type StationRow = typeof stations.$inferSelect;

export function toStation(row: StationRow): Station {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    kind: row.kind,
    area: row.area,
    cureEnvironment: row.cureEnvironment === 'own' ? 'own' : 'area',
    active: row.active,
    createdAt: row.createdAt.toISOString(),
  };
}

export async function listStations(query: StationListQuery): Promise<{ items: Station[] }> {
  const where = and(
    query.includeRetired ? undefined : eq(stations.active, true),
    query.kind ? eq(stations.kind, query.kind) : undefined,
    query.area ? eq(stations.area, query.area) : undefined,
  );
  const rows = await db.select().from(stations).where(where).orderBy(asc(stations.code));
  return { items: rows.map(toStation) };
}

/** The station row, or 404. */
export async function findStation(tx: DbOrTx, id: string, lock = false): Promise<StationRow> {
  const q = tx.select().from(stations).where(eq(stations.id, id));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('The station');
  return row;
}

export async function getStation(id: string): Promise<Station> {
  return toStation(await findStation(db, id));
}

function duplicateCode(code: string) {
  return conflict('DUPLICATE_CODE', `A station with the code "${code}" already exists; choose another code.`, [
    { field: 'code', message: 'is already used' },
  ]);
}

export async function createStation(actor: Actor, input: StationInput): Promise<Station> {
  requirePermission(actor, 'stations.edit');
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(stations).values(input).onConflictDoNothing({ target: stations.code }).returning();
    if (!row) throw duplicateCode(input.code);
    const station = toStation(row);
    await recordAudit(tx, { actorId: actor.id, action: 'station.create', entityType: 'station', entityId: row.id, after: station });
    return station;
  });
}

export async function updateStation(actor: Actor, id: string, patch: StationPatch): Promise<Station> {
  requirePermission(actor, 'stations.edit');
  return db.transaction(async (tx) => {
    const before = await findStation(tx, id, true);
    if (patch.code && patch.code !== before.code) {
      const [clash] = await tx
        .select({ id: stations.id })
        .from(stations)
        .where(and(eq(stations.code, patch.code), ne(stations.id, id)));
      if (clash) throw duplicateCode(patch.code);
    }
    const [row] = await tx.update(stations).set(patch).where(eq(stations.id, id)).returning();
    if (patch.active === false) await unloadEverything(tx, actor, id);
    const after = toStation(row);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'station.update',
      entityType: 'station',
      entityId: id,
      before: toStation(before),
      after,
    });
    return after;
  });
}

/** Retire a station: it refuses loads from now on and everything loaded there is unloaded. */
export async function retireStation(actor: Actor, id: string): Promise<Station> {
  requirePermission(actor, 'stations.edit');
  return db.transaction(async (tx) => {
    const before = await findStation(tx, id, true);
    if (!before.active) return toStation(before);
    const [row] = await tx.update(stations).set({ active: false }).where(eq(stations.id, id)).returning();
    await unloadEverything(tx, actor, id);
    const after = toStation(row);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'station.retire',
      entityType: 'station',
      entityId: id,
      before: toStation(before),
      after,
    });
    return after;
  });
}

async function unloadEverything(tx: DbOrTx, actor: Actor, stationId: string): Promise<void> {
  const rows = await tx
    .update(stationLoads)
    .set({ unloadedAt: new Date() })
    .where(and(eq(stationLoads.stationId, stationId), isNull(stationLoads.unloadedAt)))
    .returning();
  await auditUnloads(tx, actor.id, rows, 'station retired');
}
