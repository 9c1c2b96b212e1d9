import { sql, type SQL } from 'drizzle-orm';
import { notFound } from '../../errors';
import { DRIVER_STATUSES } from '../../../shared/constants';
import type { DriverStatusCounts, LotTrace, LotUse, TraceBatch, TraceDriver, TraceLot } from '../../../shared/schemas/trace';
import { runStatements } from './statements';
import { lotUses, type LotUseRow } from './walk';

/** Prefix of the prepared statements' names (the benchmark runs the same ones bare). */
export const LOT_TRACE_STATEMENTS = 'trace_lot';

interface LotRow {
  id: string;
  supplier_lot: string;
  status: TraceLot['status'];
  received_at: Date;
  certificate_id: string | null;
  material_id: string;
  material_code: string;
  material_name: string;
  supplier_id: string;
  supplier_name: string;
}

/** A step run that used the lot, with the container (and mix) it used it through: the walk's row. */
interface UseRow extends Pick<LotUseRow, 'step_run_id' | 'container_code' | 'mix_code'> {
  kind: 'build' | 'rework';
  batch_id: string;
  driver_id: string | null;
  driver_serial: string | null;
  step_id: string;
  step_name: string;
  seq: number;
  station_code: string;
  started_at: Date;
  finished_at: Date | null;
  batch_code: string;
  batch_created_at: Date;
  model_id: string;
  model_code: string;
  model_name: string;
  model_revision: number;
}

interface DriverRow {
  id: string;
  serial: string;
  status: TraceDriver['status'];
  batch_id: string;
}

export interface LotTraceData {
  trace: LotTrace;
  /** Which runs reached which drivers, for the containment CSV. */
  driverIdsByRun: Map<string, string[]>;
  driverById: Map<string, DriverRow>;
  usesRaw: UseRow[];
}

const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

/** Step runs that used a container of the lot, directly or as a part of a mix (the genealogy walk). */
const lotRunsCte = (lotId: string) => sql`
  used AS (SELECT DISTINCT u.step_run_id, u.container_code, u.mix_code FROM (${lotUses(sql`c.lot_id = ${lotId}`)}) u)`;

/**
 * The three statements of a forward trace, independent of each other so they run side by side:
 * the lot; its uses (step runs with batch, model, station); and the drivers reached — every
 * driver of a batch a whole-batch run used the lot in, plus the single units reworked with it.
 */
export function lotTraceQueries(lotId: string): { header: SQL; uses: SQL; drivers: SQL } {
  return {
    header: sql`
      SELECT l.id, l.supplier_lot, l.status, l.received_at, l.certificate_id,
             m.id AS material_id, m.code AS material_code, m.name AS material_name,
             s.id AS supplier_id, s.name AS supplier_name
      FROM lots l JOIN materials m ON m.id = l.material_id JOIN suppliers s ON s.id = l.supplier_id
      WHERE l.id = ${lotId}`,
    uses: sql`
      WITH ${lotRunsCte(lotId)}
      SELECT sr.id AS step_run_id, sr.kind, sr.batch_id, sr.driver_id, d.serial AS driver_serial,
             sr.step_id, rs.name AS step_name, rs.seq, st.code AS station_code, sr.started_at, sr.finished_at,
             u.container_code, u.mix_code,
             b.code AS batch_code, b.created_at AS batch_created_at, dm.id AS model_id, dm.code AS model_code, dm.name AS model_name,
             dm.revision AS model_revision
      FROM used u
      JOIN step_runs sr ON sr.id = u.step_run_id
      JOIN recipe_steps rs ON rs.id = sr.step_id
      JOIN stations st ON st.id = sr.station_id
      JOIN build_batches b ON b.id = sr.batch_id
      JOIN driver_models dm ON dm.id = b.model_id
      LEFT JOIN drivers d ON d.id = sr.driver_id
      ORDER BY sr.started_at, b.code, rs.seq, u.container_code, u.mix_code NULLS FIRST`,
    drivers: sql`
      WITH ${lotRunsCte(lotId)},
      runs AS (SELECT DISTINCT sr.batch_id, sr.driver_id FROM step_runs sr WHERE sr.id = ANY(ARRAY(SELECT step_run_id FROM used)))
      -- "= ANY(ARRAY(subquery))" keeps these on the primary-key and batch indexes whatever the estimates say.
      SELECT d.id, d.serial, d.status, d.batch_id
        FROM drivers d WHERE d.batch_id = ANY(ARRAY(SELECT batch_id FROM runs WHERE driver_id IS NULL))
      UNION
      SELECT d.id, d.serial, d.status, d.batch_id
        FROM drivers d WHERE d.id = ANY(ARRAY(SELECT driver_id FROM runs WHERE driver_id IS NOT NULL))
      ORDER BY serial`,
  };
}

export function countByStatus(list: { status: TraceDriver['status'] }[]): DriverStatusCounts {
  const counts = Object.fromEntries(DRIVER_STATUSES.map((s) => [s, 0])) as Omit<DriverStatusCounts, 'total'>;
  for (const d of list) counts[d.status] += 1;
  return { total: list.length, ...counts };
}

export async function loadLotTrace(lotId: string): Promise<LotTraceData> {
  const { header, uses: usesRes, drivers: reached } = await runStatements(LOT_TRACE_STATEMENTS, lotTraceQueries(lotId));
  const h = header[0] as LotRow | undefined;
  if (!h) throw notFound('The lot');
  const lot: TraceLot = {
    id: h.id,
    supplierLot: h.supplier_lot,
    status: h.status,
    receivedAt: iso(h.received_at)!,
    certificateId: h.certificate_id,
    materialId: h.material_id,
    materialCode: h.material_code,
    materialName: h.material_name,
    supplierId: h.supplier_id,
    supplierName: h.supplier_name,
  };
  const usesRaw = usesRes as UseRow[];
  const driverRows = reached as DriverRow[];
  const wholeBatchIds = [...new Set(usesRaw.filter((u) => !u.driver_id).map((u) => u.batch_id))];

  const driverById = new Map(driverRows.map((d) => [d.id, d]));
  const driversByBatch = new Map<string, DriverRow[]>();
  for (const d of driverRows) {
    const list = driversByBatch.get(d.batch_id) ?? [];
    list.push(d);
    driversByBatch.set(d.batch_id, list);
  }
  const wholeBatch = new Set(wholeBatchIds);
  const driverIdsByRun = new Map<string, string[]>();
  const batches = new Map<string, TraceBatch>();
  for (const u of usesRaw) {
    const reached = u.driver_id ? [u.driver_id] : (driversByBatch.get(u.batch_id) ?? []).map((d) => d.id);
    driverIdsByRun.set(u.step_run_id, reached);
    if (!batches.has(u.batch_id)) {
      batches.set(u.batch_id, {
        id: u.batch_id,
        code: u.batch_code,
        modelId: u.model_id,
        modelCode: u.model_code,
        modelName: u.model_name,
        modelRevision: u.model_revision,
        createdAt: iso(u.batch_created_at)!,
        wholeBatch: wholeBatch.has(u.batch_id),
        driverCount: (driversByBatch.get(u.batch_id) ?? []).length,
      });
    }
  }
  const uses: LotUse[] = usesRaw.map((u) => ({
    stepRunId: u.step_run_id,
    kind: u.kind,
    batchId: u.batch_id,
    driverSerial: u.driver_serial,
    stepId: u.step_id,
    stepName: u.step_name,
    seq: u.seq,
    stationCode: u.station_code,
    startedAt: iso(u.started_at)!,
    finishedAt: iso(u.finished_at),
    containerCode: u.container_code,
    mixCode: u.mix_code,
  }));
  const driversOut: TraceDriver[] = driverRows.map((d) => ({ serial: d.serial, status: d.status, batchId: d.batch_id }));
  return {
    trace: { lot, uses, batches: [...batches.values()], drivers: driversOut, counts: countByStatus(driversOut) },
    driverIdsByRun,
    driverById,
    usesRaw,
  };
}

/** GET /api/lots/:id/trace — forward genealogy of one lot (any signed-in person). */
export async function traceLot(lotId: string): Promise<LotTrace> {
  return (await loadLotTrace(lotId)).trace;
}
