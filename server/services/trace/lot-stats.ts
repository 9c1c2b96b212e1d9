import { sql } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { readSetting } from '../settings';
import { plantBaseline } from '../quality/baseline';
import { flagLots } from '../../../shared/stats';
import type { LotStat, LotStats, LotStatsQuery } from '../../../shared/schemas/trace';
import { lotUses } from './walk';

interface Row {
  lot_id: string;
  supplier_lot: string;
  status: LotStat['status'];
  received_at: Date;
  material_id: string;
  material_code: string;
  material_name: string;
  built: number;
  tested: number;
  failures: number;
}

/**
 * GET /api/lots/stats — per lot: drivers built with it, how many were tested and failed, and
 * whether that is unlikely under the plant's baseline failure rate (shared/stats flagLots:
 * exact binomial test with Benjamini–Hochberg over the lots listed, or above the p-chart limit).
 * Counted per batch (the batch_outcomes table, kept by triggers), so no driver or test row is read.
 * `tx`: the caller's transaction (the compliance watch runs it inside its locked sweep).
 */
export async function lotStats(query: LotStatsQuery, tx: DbOrTx = db): Promise<LotStats> {
  const baseline = (await plantBaseline(tx)).rate;
  const fdr = await readSetting('falseDiscoveryRate', tx);
  const res = await tx.execute(sql`
    WITH l AS (
      SELECT l.id, l.supplier_lot, l.status, l.received_at, m.id AS material_id, m.code AS material_code, m.name AS material_name
      FROM lots l JOIN materials m ON m.id = l.material_id
      WHERE l.received_at >= now() - make_interval(days => ${query.days})
        ${query.materialId ? sql`AND l.material_id = ${query.materialId}` : sql``}
    ),
    lot_batches AS (
      SELECT DISTINCT u.lot_id, sr.batch_id
      FROM (${lotUses(sql`c.lot_id IN (SELECT id FROM l)`)}) u
      JOIN step_runs sr ON sr.id = u.step_run_id AND sr.driver_id IS NULL AND sr.kind = 'build'
    ),
    -- Per batch: drivers built, tested at least once, failed at least once (kept by triggers).
    outcomes AS (
      SELECT bo.batch_id, bo.drivers AS built, bo.tested, bo.failed AS failures
      FROM batch_outcomes bo WHERE bo.batch_id IN (SELECT batch_id FROM lot_batches)
    )
    SELECT l.id AS lot_id, l.supplier_lot, l.status, l.received_at, l.material_id, l.material_code, l.material_name,
           coalesce(sum(bo.built), 0)::int AS built, coalesce(sum(bo.tested), 0)::int AS tested, coalesce(sum(bo.failures), 0)::int AS failures
    FROM l
    LEFT JOIN lot_batches lb ON lb.lot_id = l.id
    LEFT JOIN outcomes bo ON bo.batch_id = lb.batch_id
    GROUP BY l.id, l.supplier_lot, l.status, l.received_at, l.material_id, l.material_code, l.material_name`);
  const rows = res.rows as unknown as Row[];
  const flagged = flagLots(
    rows.map((r) => ({ ...r, inspected: r.tested, defectives: r.failures })),
    baseline,
    fdr,
  );
  const items: LotStat[] = flagged
    .map((r) => ({
      lotId: r.lot_id,
      supplierLot: r.supplier_lot,
      status: r.status,
      receivedAt: new Date(r.received_at).toISOString(),
      materialId: r.material_id,
      materialCode: r.material_code,
      materialName: r.material_name,
      driversBuilt: r.built,
      tested: r.tested,
      failures: r.failures,
      failureRate: r.tested > 0 ? r.failures / r.tested : null,
      pValue: r.pValue,
      qValue: r.qValue,
      aboveUcl: r.aboveUcl,
      flagged: r.flagged,
    }))
    .filter((r) => !query.flaggedOnly || r.flagged)
    .sort((a, b) => Number(b.flagged) - Number(a.flagged) || a.pValue - b.pValue || a.supplierLot.localeCompare(b.supplierLot));
  return { baseline, q: fdr, days: query.days, items };
}
