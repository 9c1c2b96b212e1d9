/**
 * What the stock view reads from the database: materials, containers in stock, what finished
 * step runs drew over the window, what open batches still need, and past receipts.
 */
import { and, eq, gt, inArray, notInArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials } from '../../db/schema';
import type { ContainerRow, LotRow, MaterialRow } from '../lots/present';

export interface StockRow {
  container: ContainerRow;
  lot: LotRow;
}

export interface StockData {
  materials: MaterialRow[];
  /** Containers with something left, sealed or open, of lots on hold, released or quarantined. */
  stock: Map<string, StockRow[]>;
  /** Quantity drawn per material by step runs finished in the window. */
  history: Map<string, number>;
  /** What open batches still need per material (recipe amount × units still to build). */
  plan: Map<string, number>;
  /** Recent receipts per material (newest first, at most 10), for shelf life at arrival. */
  receipts: Map<string, LotRow[]>;
  /** Size of the containers of the latest receipt per material (the pack size bought). */
  packSize: Map<string, number>;
}

function group<T>(rows: T[], key: (r: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const r of rows) {
    const k = key(r);
    const list = out.get(k);
    if (list) list.push(r);
    else out.set(k, [r]);
  }
  return out;
}

/** Quantity drawn per material by step runs finished in (since, until]; a mix's draw is split by its parts. */
export async function consumedBetween(tx: DbOrTx, since: Date, until: Date, materialIds?: string[]): Promise<Map<string, number>> {
  const only = materialIds
    ? sql`AND material_id IN (${sql.join(
        materialIds.map((id) => sql`${id}::uuid`),
        sql`, `,
      )})`
    : sql``;
  const rows = await tx.execute<{ material_id: string; qty: string }>(sql`
    WITH runs AS (
      SELECT srm.container_id, srm.mix_id, srm.quantity_used
      FROM step_run_materials srm
      JOIN step_runs sr ON sr.id = srm.step_run_id
      WHERE sr.finished_at > ${since.toISOString()}::timestamptz AND sr.finished_at <= ${until.toISOString()}::timestamptz
        AND srm.quantity_used > 0
    ), drawn AS (
      SELECT l.material_id, r.quantity_used AS qty
      FROM runs r JOIN containers c ON c.id = r.container_id JOIN lots l ON l.id = c.lot_id
      UNION ALL
      SELECT l.material_id, r.quantity_used * mx.resin_quantity / (mx.resin_quantity + mx.hardener_quantity)
      FROM runs r JOIN mixes mx ON mx.id = r.mix_id JOIN containers c ON c.id = mx.resin_container_id JOIN lots l ON l.id = c.lot_id
      UNION ALL
      SELECT l.material_id, r.quantity_used * mx.hardener_quantity / (mx.resin_quantity + mx.hardener_quantity)
      FROM runs r JOIN mixes mx ON mx.id = r.mix_id JOIN containers c ON c.id = mx.hardener_container_id JOIN lots l ON l.id = c.lot_id
    )
    SELECT material_id, SUM(qty)::text AS qty FROM drawn WHERE true ${only} GROUP BY material_id`);
  return new Map(rows.rows.map((r) => [r.material_id, Number(r.qty)]));
}

/** What open batches still need: per recipe step, amount per unit × (batch quantity − units finished at that step). */
export async function planDemand(tx: DbOrTx): Promise<Map<string, number>> {
  const rows = await tx.execute<{ material_id: string; qty: string }>(sql`
    SELECT rsm.material_id, SUM(rsm.amount_per_unit * GREATEST(b.quantity - COALESCE(done.units, 0), 0))::text AS qty
    FROM build_batches b
    JOIN recipe_steps rs ON rs.model_id = b.model_id
    JOIN recipe_step_materials rsm ON rsm.step_id = rs.id
    LEFT JOIN LATERAL (
      SELECT SUM(sr.units_done) AS units FROM step_runs sr
      WHERE sr.batch_id = b.id AND sr.step_id = rs.id AND sr.kind = 'build' AND sr.finished_at IS NOT NULL
    ) done ON true
    WHERE b.status IN ('open', 'in_process')
    GROUP BY rsm.material_id`);
  return new Map(rows.rows.map((r) => [r.material_id, Number(r.qty)]).filter(([, q]) => (q as number) > 0) as [string, number][]);
}

export async function loadStockData(tx: DbOrTx, now: Date, windowDays: number, materialId?: string): Promise<StockData> {
  const materialRows = await tx
    .select()
    .from(materials)
    .where(materialId ? eq(materials.id, materialId) : eq(materials.active, true))
    .orderBy(materials.code);
  const ids = materialRows.map((m) => m.id);
  if (ids.length === 0) {
    return { materials: [], stock: new Map(), history: new Map(), plan: new Map(), receipts: new Map(), packSize: new Map() };
  }
  const stockRows = await tx
    .select({ container: containers, lot: lots })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .where(
      and(
        inArray(lots.materialId, ids),
        inArray(lots.status, ['on_hold', 'released', 'quarantined']),
        inArray(containers.status, ['sealed', 'open']),
        gt(containers.remaining, '0'),
      ),
    );
  const since = new Date(now.getTime() - windowDays * 86_400_000);
  const history = await consumedBetween(tx, since, now, materialId ? ids : undefined);
  const plan = await planDemand(tx);

  // Newest ten receipts per material (rejected lots say nothing about what a supplier ships).
  const receiptRows = await tx.execute<{ id: string }>(sql`
    SELECT id FROM (
      SELECT l.id, row_number() OVER (PARTITION BY l.material_id ORDER BY l.received_at DESC) AS n
      FROM lots l WHERE l.material_id IN (${sql.join(
        ids.map((id) => sql`${id}::uuid`),
        sql`, `,
      )}) AND l.status <> 'rejected'
    ) x WHERE n <= 10`);
  const receiptIds = receiptRows.rows.map((r) => r.id);
  const receiptLots = receiptIds.length
    ? await tx
        .select()
        .from(lots)
        .where(and(inArray(lots.id, receiptIds), notInArray(lots.status, ['rejected'])))
    : [];
  receiptLots.sort((a, b) => b.receivedAt.getTime() - a.receivedAt.getTime());
  const receipts = group(receiptLots, (l) => l.materialId);

  const packSize = new Map<string, number>();
  if (receiptLots.length) {
    const latest = [...receipts.values()].map((list) => list[0].id);
    const packRows = await tx
      .select({ lotId: containers.lotId, quantity: containers.quantity })
      .from(containers)
      .where(inArray(containers.lotId, latest));
    const byLot = new Map(packRows.map((r) => [r.lotId, Number(r.quantity)]));
    for (const [mid, list] of receipts) {
      const q = byLot.get(list[0].id);
      if (q !== undefined) packSize.set(mid, q);
    }
  }

  return {
    materials: materialRows,
    stock: group(stockRows, (r) => r.lot.materialId),
    history,
    plan,
    receipts,
    packSize,
  };
}
