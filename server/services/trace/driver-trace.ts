import { sql } from 'drizzle-orm';
import { db } from '../../db/client';
import type { DriverTrace, TraceMaterial, TraceStep } from '../../../shared/schemas/trace';
import { findDriverWithBatch } from '../drivers/lookup';
import { testHistory } from '../testing/records';

interface Row {
  step_run_id: string;
  step_id: string;
  step_name: string;
  seq: number;
  kind: 'build' | 'rework';
  driver_id: string | null;
  station_id: string;
  station_code: string;
  station_name: string;
  started_at: Date;
  finished_at: Date | null;
  short_cure: boolean;
  deviation_id: string | null;
  container_id: string | null;
  container_code: string | null;
  quantity_used: string | null;
  mix_id: string | null;
  mix_code: string | null;
  mixed_at: Date | null;
  part: 'resin' | 'hardener' | null;
  lot_id: string;
  supplier_lot: string;
  lot_status: TraceMaterial['lotStatus'];
  certificate_id: string | null;
  material_id: string;
  material_code: string;
  material_name: string;
  material_kind: TraceMaterial['materialKind'];
  supplier_id: string;
  supplier_name: string;
}

/**
 * Every step run that built this driver with the containers it used, a mix expanded into its
 * resin and hardener containers: the batch's whole-batch runs plus runs on this driver alone
 * (rework). One query, driven by the step_runs batch and driver indexes.
 */
export function genealogyQuery(batchId: string, driverId: string) {
  return sql`
    SELECT sr.id AS step_run_id, sr.step_id, rs.name AS step_name, rs.seq, sr.kind, sr.driver_id,
           sr.station_id, st.code AS station_code, st.name AS station_name,
           sr.started_at, sr.finished_at, sr.short_cure, sr.deviation_id,
           c.id AS container_id, c.code AS container_code, srm.quantity_used,
           mx.id AS mix_id, mx.code AS mix_code, mx.mixed_at, part.part,
           l.id AS lot_id, l.supplier_lot, l.status AS lot_status, l.certificate_id,
           mat.id AS material_id, mat.code AS material_code, mat.name AS material_name, mat.kind AS material_kind,
           sup.id AS supplier_id, sup.name AS supplier_name
    FROM step_runs sr
    JOIN recipe_steps rs ON rs.id = sr.step_id
    JOIN stations st ON st.id = sr.station_id
    LEFT JOIN step_run_materials srm ON srm.step_run_id = sr.id
    LEFT JOIN mixes mx ON mx.id = srm.mix_id
    LEFT JOIN LATERAL (
      VALUES (srm.container_id, NULL::text, 0), (mx.resin_container_id, 'resin', 1), (mx.hardener_container_id, 'hardener', 2)
    ) AS part(container_id, part, ord) ON part.container_id IS NOT NULL
    LEFT JOIN containers c ON c.id = part.container_id
    LEFT JOIN lots l ON l.id = c.lot_id
    LEFT JOIN materials mat ON mat.id = l.material_id
    LEFT JOIN suppliers sup ON sup.id = l.supplier_id
    WHERE (sr.batch_id = ${batchId} AND sr.driver_id IS NULL) OR sr.driver_id = ${driverId}
    ORDER BY sr.kind = 'rework', sr.started_at, rs.seq, sr.id, srm.loaded_at, srm.id, part.ord`;
}

export function stepsFromRows(rows: Row[]): TraceStep[] {
  const steps: TraceStep[] = [];
  const byRun = new Map<string, TraceStep>();
  for (const r of rows) {
    let step = byRun.get(r.step_run_id);
    if (!step) {
      step = {
        stepRunId: r.step_run_id,
        stepId: r.step_id,
        stepName: r.step_name,
        seq: r.seq,
        kind: r.kind,
        driverId: r.driver_id,
        stationId: r.station_id,
        stationCode: r.station_code,
        stationName: r.station_name,
        startedAt: new Date(r.started_at).toISOString(),
        finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
        shortCure: r.short_cure,
        deviationId: r.deviation_id,
        materials: [],
      };
      byRun.set(r.step_run_id, step);
      steps.push(step);
    }
    if (!r.container_id || !r.container_code) continue;
    const material: TraceMaterial = {
      containerId: r.container_id,
      containerCode: r.container_code,
      lotId: r.lot_id,
      supplierLot: r.supplier_lot,
      lotStatus: r.lot_status,
      materialId: r.material_id,
      materialCode: r.material_code,
      materialName: r.material_name,
      materialKind: r.material_kind,
      supplierId: r.supplier_id,
      supplierName: r.supplier_name,
      certificateId: r.certificate_id,
      quantityUsed: Number(r.quantity_used ?? 0),
    };
    if (r.mix_id && r.mix_code && r.mixed_at && r.part) {
      material.via = { mixId: r.mix_id, mixCode: r.mix_code, mixedAt: new Date(r.mixed_at).toISOString(), part: r.part };
    }
    step.materials.push(material);
  }
  return steps;
}

/** GET /api/drivers/:serial/trace — backward genealogy of one driver (any signed-in person). */
export async function traceDriver(serial: string): Promise<DriverTrace> {
  const { driver, batch } = await findDriverWithBatch(db, serial);
  const [genealogy, tests] = await Promise.all([
    db.execute(genealogyQuery(batch.id, driver.id)),
    testHistory(db, driver.id),
  ]);
  return { driver, batch, steps: stepsFromRows(genealogy.rows as unknown as Row[]), tests };
}
