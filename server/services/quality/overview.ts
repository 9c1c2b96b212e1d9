import { sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db } from '../../db/client';
import { config } from '../../config';
import { pChartLimits } from '../../../shared/stats';
import { firstPassYield, pareto } from '../../../shared/quality';
import type { QualityOverview, QualityOverviewQuery } from '../../../shared/schemas/quality';
import { requirePermission, type Actor } from '../auth/actor';
import { lotStats } from '../trace/lot-stats';
import { plantBaseline } from './baseline';

const DEFAULT_WEEKS = 12;

/** The period as plant dates and the instants that bound it ([from 00:00, to + 1 day 00:00) in the plant). */
function period(query: QualityOverviewQuery, now: Date) {
  const zone = config.plantZone;
  const today = DateTime.fromJSDate(now, { zone }).startOf('day');
  const to = query.to ? DateTime.fromISO(query.to, { zone }) : today;
  const from = query.from ? DateTime.fromISO(query.from, { zone }) : to.minus({ weeks: DEFAULT_WEEKS }).plus({ days: 1 });
  return {
    fromDate: from.toISODate()!,
    toDate: to.toISODate()!,
    start: from.toJSDate(),
    end: to.plus({ days: 1 }).toJSDate(),
    days: Math.max(1, Math.ceil(today.diff(from, 'days').days) + 1),
  };
}

/**
 * GET /api/quality/overview: the plant's failure picture for quality — lot p-chart against the
 * baseline, failures by defect code (Pareto), first-pass yield by model and week, short cures
 * and deviations in the period, and lots waiting for incoming inspection.
 */
export async function qualityOverview(actor: Actor, query: QualityOverviewQuery, now = new Date()): Promise<QualityOverview> {
  requirePermission(actor, 'quality.overview');
  const p = period(query, now);
  const baseline = await plantBaseline(db, now);
  const modelFilter = query.modelId ? sql`AND b.model_id = ${query.modelId}` : sql``;

  // p-chart: lots received in the period and tested, judged against the baseline as a given standard.
  const stats = await lotStats({ days: p.days, flaggedOnly: false });
  const pChart = stats.items
    .filter((l) => l.tested > 0)
    .map((l) => {
      const { ucl, lcl } = pChartLimits(baseline.rate, l.tested);
      return {
        lotId: l.lotId,
        lotLabel: `${l.materialCode} · ${l.supplierLot}`,
        materialId: l.materialId,
        materialName: l.materialName,
        lotStatus: l.status,
        tested: l.tested,
        failed: l.failures,
        p: l.failures / l.tested,
        centre: baseline.rate,
        ucl,
        lcl,
        pValue: l.pValue,
        qValue: l.qValue,
        flagged: l.flagged,
      };
    })
    .sort((a, b) => a.lotLabel.localeCompare(b.lotLabel));

  const defects = (
    await db.execute<{ code: string; description: string | null; count: number }>(sql`
      SELECT t.defect_code AS code, dc.description, count(*)::int AS count
      FROM test_results t
      JOIN drivers d ON d.id = t.driver_id
      JOIN build_batches b ON b.id = d.batch_id
      LEFT JOIN defect_codes dc ON dc.code = t.defect_code
      WHERE t.result = 'fail' AND t.tested_at >= ${p.start} AND t.tested_at < ${p.end} ${modelFilter}
      GROUP BY t.defect_code, dc.description`)
  ).rows;
  const descriptions = new Map(defects.map((d) => [d.code, d.description ?? d.code]));
  const paretoBars = pareto(defects.map((d) => ({ defectCode: d.code, count: d.count }))).map((b) => ({
    ...b,
    description: descriptions.get(b.defectCode) ?? b.defectCode,
  }));

  // First-pass yield: each driver counted in the plant week of its first final test.
  const fpyRows = (
    await db.execute<{ model_id: string; model_code: string; week: string; built: number; passed: number }>(sql`
      WITH first AS (
        SELECT DISTINCT ON (t.driver_id) t.driver_id, t.result, t.tested_at
        FROM test_results t ORDER BY t.driver_id, t.tested_at, t.id
      )
      SELECT b.model_id, m.code AS model_code,
             to_char(date_trunc('week', f.tested_at AT TIME ZONE ${config.plantZone}), 'YYYY-MM-DD') AS week,
             count(*)::int AS built, count(*) FILTER (WHERE f.result = 'pass')::int AS passed
      FROM first f
      JOIN drivers d ON d.id = f.driver_id
      JOIN build_batches b ON b.id = d.batch_id
      JOIN driver_models m ON m.id = b.model_id
      WHERE f.tested_at >= ${p.start} AND f.tested_at < ${p.end} ${modelFilter}
      GROUP BY b.model_id, m.code, week
      ORDER BY m.code, week`)
  ).rows;

  const shortCures = (
    await db.execute<{ id: string; batch_id: string; batch_code: string; step: string; started_at: string; reason: string | null }>(sql`
      SELECT sr.id, b.id AS batch_id, b.code AS batch_code, rs.name AS step, sr.started_at, dv.reason
      FROM step_runs sr
      JOIN build_batches b ON b.id = sr.batch_id
      JOIN recipe_steps rs ON rs.id = sr.step_id
      LEFT JOIN deviations dv ON dv.id = sr.deviation_id
      WHERE sr.short_cure AND sr.started_at >= ${p.start} AND sr.started_at < ${p.end} ${modelFilter}
      ORDER BY sr.started_at DESC LIMIT 200`)
  ).rows;

  const deviations = (
    await db.execute<{ id: string; kind: string; batch_code: string | null; reason: string; signed_by: string; signed_at: string }>(sql`
      SELECT dv.id, dv.kind, b.code AS batch_code, dv.reason, u.name AS signed_by, dv.signed_at
      FROM deviations dv
      JOIN users u ON u.id = dv.signed_by
      LEFT JOIN build_batches b ON b.id = dv.batch_id
      WHERE dv.signed_at >= ${p.start} AND dv.signed_at < ${p.end}
      ORDER BY dv.signed_at DESC LIMIT 200`)
  ).rows;

  const onHold = (
    await db.execute<{ id: string; supplier_lot: string; material: string; received_at: string }>(sql`
      SELECT l.id, l.supplier_lot, m.name AS material, l.received_at
      FROM lots l JOIN materials m ON m.id = l.material_id
      WHERE l.status = 'on_hold'
      ORDER BY l.received_at ASC LIMIT 200`)
  ).rows;

  const iso = (v: string | Date) => new Date(v).toISOString();
  return {
    from: p.fromDate,
    to: p.toDate,
    baseline,
    pChart,
    pareto: paretoBars,
    firstPassYield: fpyRows.map((r) => ({
      modelId: r.model_id,
      modelCode: r.model_code,
      week: r.week,
      built: r.built,
      passedFirstTime: r.passed,
      fpy: firstPassYield(r.built, r.passed),
    })),
    shortCures: shortCures.map((r) => ({
      stepRunId: r.id,
      batchId: r.batch_id,
      batchCode: r.batch_code,
      step: r.step,
      startedAt: iso(r.started_at),
      deviation: r.reason,
    })),
    openDeviations: deviations.map((r) => ({
      id: r.id,
      kind: r.kind,
      batchCode: r.batch_code,
      reason: r.reason,
      signedBy: r.signed_by,
      signedAt: iso(r.signed_at),
    })),
    lotsAwaitingInspection: onHold.map((r) => ({
      lotId: r.id,
      supplierLot: r.supplier_lot,
      materialName: r.material,
      receivedAt: iso(r.received_at),
      ageHours: (now.getTime() - new Date(r.received_at).getTime()) / 3_600_000,
    })),
  };
}
