import { sql, type SQL } from 'drizzle-orm';
import { notFound } from '../../errors';
import type { DriverTrace, TraceMaterial, TraceStep } from '../../../shared/schemas/trace';
import type { TestRecord } from '../../../shared/schemas/tests';
import type { DriverBatch } from '../../../shared/schemas/drivers';
import { toTestRecord } from '../testing/records';
import { runStatements } from './statements';
import { usesOfRun, type MaterialUseRow } from './walk';

type Nullable<T> = { [K in keyof T]: T[K] | null };

/** Prefix of the prepared statements' names (the benchmark runs the same ones bare). */
export const DRIVER_TRACE_STATEMENTS = 'trace_driver';

interface HeaderRow {
  id: string;
  serial: string;
  batch_id: string;
  status: DriverTrace['driver']['status'];
  created_at: Date;
  batch_code: string;
  batch_status: DriverBatch['status'];
  quantity: number;
  batch_created_at: Date;
  model_id: string;
  model_code: string;
  model_name: string;
  model_revision: number;
}

/** A step run with one container it used (the walk's row; all null for a run that used nothing). */
interface StepRow extends Nullable<Pick<MaterialUseRow, 'quantity_used' | 'mix_id' | 'mix_code' | 'mixed_at' | 'part'>> {
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

interface TestRow {
  id: string;
  driver_id: string;
  result: 'pass' | 'fail';
  defect_code: string | null;
  defect_description: string | null;
  measurements: Record<string, number> | null;
  tested_at: Date;
  tested_by: string | null;
  tested_by_name: string | null;
}

/**
 * The three statements of a backward trace. Each starts from the serial (drivers_serial_uq), so
 * they are independent and run side by side: the driver with batch and model; every step run
 * that built it with the containers used (the genealogy walk: a mix as its resin and hardener containers)
 * — the batch's whole-batch runs plus runs on this driver alone (rework); its final tests.
 */
export function driverTraceQueries(serial: string): { header: SQL; steps: SQL; tests: SQL } {
  return {
    header: sql`
      SELECT d.id, d.serial, d.batch_id, d.status, d.created_at,
             b.code AS batch_code, b.status AS batch_status, b.quantity, b.created_at AS batch_created_at,
             dm.id AS model_id, dm.code AS model_code, dm.name AS model_name, dm.revision AS model_revision
      FROM drivers d JOIN build_batches b ON b.id = d.batch_id JOIN driver_models dm ON dm.id = b.model_id
      WHERE d.serial = ${serial}`,
    steps: sql`
      WITH d AS (SELECT id, batch_id FROM drivers WHERE serial = ${serial}),
      runs AS (
        SELECT sr.* FROM d JOIN step_runs sr ON sr.batch_id = d.batch_id AND sr.driver_id IS NULL
        UNION ALL
        SELECT sr.* FROM d JOIN step_runs sr ON sr.driver_id = d.id
      )
      SELECT sr.id AS step_run_id, sr.step_id, rs.name AS step_name, rs.seq, sr.kind, sr.driver_id,
             sr.station_id, st.code AS station_code, st.name AS station_name,
             sr.started_at, sr.finished_at, sr.short_cure, sr.deviation_id,
             c.id AS container_id, c.code AS container_code, mu.quantity_used,
             mu.mix_id, mu.mix_code, mu.mixed_at, mu.part,
             l.id AS lot_id, l.supplier_lot, l.status AS lot_status, l.certificate_id,
             mat.id AS material_id, mat.code AS material_code, mat.name AS material_name, mat.kind AS material_kind,
             sup.id AS supplier_id, sup.name AS supplier_name
      FROM runs sr
      JOIN recipe_steps rs ON rs.id = sr.step_id
      JOIN stations st ON st.id = sr.station_id
      LEFT JOIN LATERAL ${usesOfRun(sql`sr.id`)} mu ON true
      LEFT JOIN containers c ON c.id = mu.container_id
      LEFT JOIN lots l ON l.id = c.lot_id
      LEFT JOIN materials mat ON mat.id = l.material_id
      LEFT JOIN suppliers sup ON sup.id = l.supplier_id
      ORDER BY sr.kind = 'rework', sr.started_at, rs.seq, sr.id, mu.loaded_at, mu.use_id, mu.part_ord`,
    tests: sql`
      SELECT t.id, t.driver_id, t.result, t.defect_code, dc.description AS defect_description, t.measurements,
             t.tested_at, t.tested_by, u.name AS tested_by_name
      FROM drivers d
      JOIN test_results t ON t.driver_id = d.id
      LEFT JOIN defect_codes dc ON dc.code = t.defect_code
      LEFT JOIN users u ON u.id = t.tested_by
      WHERE d.serial = ${serial}
      ORDER BY t.tested_at, t.id`,
  };
}

const iso = (d: Date | string) => new Date(d).toISOString();

function stepsFromRows(rows: StepRow[]): TraceStep[] {
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
        startedAt: iso(r.started_at),
        finishedAt: r.finished_at ? iso(r.finished_at) : null,
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
      material.via = { mixId: r.mix_id, mixCode: r.mix_code, mixedAt: iso(r.mixed_at), part: r.part };
    }
    step.materials.push(material);
  }
  return steps;
}

const testsFromRows = (rows: TestRow[]): TestRecord[] =>
  rows.map((t) =>
    toTestRecord({
      id: t.id,
      driverId: t.driver_id,
      result: t.result,
      defectCode: t.defect_code,
      defectDescription: t.defect_description,
      measurements: t.measurements,
      testedAt: new Date(t.tested_at),
      testedBy: t.tested_by,
      testedByName: t.tested_by_name,
    }),
  );

/** GET /api/drivers/:serial/trace — backward genealogy of one driver (any signed-in person). */
export async function traceDriver(serial: string): Promise<DriverTrace> {
  const { header, steps, tests } = await runStatements(DRIVER_TRACE_STATEMENTS, driverTraceQueries(serial));
  const h = header[0] as HeaderRow | undefined;
  if (!h) throw notFound(`Driver ${serial}`);
  return {
    driver: { id: h.id, serial: h.serial, batchId: h.batch_id, status: h.status, createdAt: iso(h.created_at) },
    batch: {
      id: h.batch_id,
      code: h.batch_code,
      status: h.batch_status,
      quantity: h.quantity,
      modelId: h.model_id,
      modelCode: h.model_code,
      modelName: h.model_name,
      modelRevision: h.model_revision,
      createdAt: iso(h.batch_created_at),
    },
    steps: stepsFromRows(steps as StepRow[]),
    tests: testsFromRows(tests as TestRow[]),
  };
}
