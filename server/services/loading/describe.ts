import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { buildBatches, stationLoads } from '../../db/schema';
import type { StationLoad, StationLoaded, LoadedMaterial } from '../../../shared/schemas/station-loads';
import { findStation } from '../stations';
import { containersByIds, mixesByIds, type ContainerContext, type MaterialRow, type MixContext } from './context';
import { expiryOfContainer, expiryOfMix } from './usability';

type LoadRow = typeof stationLoads.$inferSelect;

/** What a load of a container says of it: the container, its lot and material, and when it expires. */
export function containerPart(c: ContainerContext, now: Date) {
  const e = expiryOfContainer(c.container, c.lot, c.material, now);
  return {
    container: containerSummary(c.container),
    mix: null,
    lot: { id: c.lot.id, supplierLot: c.lot.supplierLot, status: c.lot.status },
    material: materialSummary(c.material),
    partMaterial: null,
    partLot: null,
    expiresAt: e.at,
    expiryCause: e.cause,
  } satisfies Partial<StationLoad>;
}

export function materialSummary(m: MaterialRow): LoadedMaterial {
  return {
    id: m.id,
    code: m.code,
    name: m.name,
    kind: m.kind,
    unit: m.unit,
    hazards: { signalWord: m.hazards.signalWord, pictograms: m.hazards.pictograms ?? [], statements: m.hazards.statements ?? [] },
    sdsAttachmentId: m.sdsAttachmentId,
  };
}

export function containerSummary(c: ContainerContext['container']) {
  return {
    id: c.id,
    code: c.code,
    lotId: c.lotId,
    quantity: Number(c.quantity),
    remaining: Number(c.remaining),
    status: c.status,
    openedAt: c.openedAt?.toISOString() ?? null,
  };
}

export function mixSummary(m: MixContext['mix']) {
  return {
    id: m.id,
    code: m.code,
    remaining: Number(m.remaining),
    status: m.status,
    mixedAt: m.mixedAt.toISOString(),
    potLifeEndsAt: m.potLifeEndsAt.toISOString(),
  };
}

/** Station loads with what they hold and its effective expiry now. */
export async function describeLoads(tx: DbOrTx, rows: LoadRow[], now: Date): Promise<StationLoad[]> {
  const [cs, ms, batches] = await Promise.all([
    containersByIds(
      tx,
      rows.flatMap((r) => (r.containerId ? [r.containerId] : [])),
    ),
    mixesByIds(
      tx,
      rows.flatMap((r) => (r.mixId ? [r.mixId] : [])),
    ),
    rows.length
      ? tx
          .select({ id: buildBatches.id, code: buildBatches.code })
          .from(buildBatches)
          .where(inArray(buildBatches.id, [...new Set(rows.map((r) => r.batchId))]))
      : Promise.resolve([]),
  ]);
  const batchCode = new Map(batches.map((b) => [b.id, b.code]));
  return rows.map((r) => {
    const base = {
      id: r.id,
      stationId: r.stationId,
      batchId: r.batchId,
      batchCode: batchCode.get(r.batchId) ?? '',
      loadedAt: r.loadedAt.toISOString(),
      loadedBy: r.loadedBy,
    };
    if (r.containerId) return { ...base, ...containerPart(cs.get(r.containerId)!, now) };
    const m = ms.get(r.mixId!)!;
    const e = expiryOfMix(m.mix, [m.resin, m.hardener]);
    return {
      ...base,
      container: null,
      mix: mixSummary(m.mix),
      lot: { id: m.resin.lot.id, supplierLot: m.resin.lot.supplierLot, status: m.resin.lot.status },
      material: materialSummary(m.resin.material),
      partMaterial: materialSummary(m.hardener.material),
      partLot: { id: m.hardener.lot.id, supplierLot: m.hardener.lot.supplierLot, status: m.hardener.lot.status },
      expiresAt: e.at,
      expiryCause: e.cause,
    };
  });
}

/** GET /api/stations/:id/loaded: what is loaded now, soonest expiry first. */
export async function listLoaded(stationId: string, batchId?: string, now: Date = new Date()): Promise<StationLoaded> {
  await findStation(db, stationId);
  const rows = await db
    .select()
    .from(stationLoads)
    .where(
      and(eq(stationLoads.stationId, stationId), isNull(stationLoads.unloadedAt), batchId ? eq(stationLoads.batchId, batchId) : undefined),
    )
    .orderBy(asc(stationLoads.loadedAt));
  const items = await describeLoads(db, rows, now);
  const key = (x: StationLoad) => (x.expiresAt ? Date.parse(x.expiresAt) : Number.POSITIVE_INFINITY);
  items.sort((a, b) => key(a) - key(b));
  return { items, now: now.toISOString() };
}
