import { asc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { drivers, stepRunMaterials, stepRuns } from '../../db/schema';
import type { StepRun, StepRunMaterial } from '../../../shared/schemas/steps';
import { containersByIds, mixesByIds } from '../loading';

export type StepRunRow = typeof stepRuns.$inferSelect;

const iso = (d: Date | null) => d?.toISOString() ?? null;

/** Step runs as the API shows them, with what each used (container or mix, lot, material). */
export async function describeRuns(tx: DbOrTx, runs: StepRunRow[]): Promise<StepRun[]> {
  if (runs.length === 0) return [];
  const ids = runs.map((r) => r.id);
  const mats = await tx
    .select()
    .from(stepRunMaterials)
    .where(inArray(stepRunMaterials.stepRunId, ids))
    .orderBy(asc(stepRunMaterials.loadedAt));
  const driverIds = [...new Set(runs.flatMap((r) => (r.driverId ? [r.driverId] : [])))];
  const [cs, ms, ds] = await Promise.all([
    containersByIds(tx, [...new Set(mats.flatMap((m) => (m.containerId ? [m.containerId] : [])))]),
    mixesByIds(tx, [...new Set(mats.flatMap((m) => (m.mixId ? [m.mixId] : [])))]),
    driverIds.length
      ? tx.select({ id: drivers.id, serial: drivers.serial }).from(drivers).where(inArray(drivers.id, driverIds))
      : Promise.resolve([]),
  ]);
  const serial = new Map(ds.map((d) => [d.id, d.serial]));
  const material = (m: typeof stepRunMaterials.$inferSelect): StepRunMaterial => {
    const c = m.containerId ? cs.get(m.containerId)! : null;
    const mix = m.mixId ? ms.get(m.mixId)! : null;
    const part = c ?? mix!.resin;
    return {
      id: m.id,
      containerId: m.containerId,
      containerCode: c?.container.code ?? null,
      mixId: m.mixId,
      mixCode: mix?.mix.code ?? null,
      materialId: part.material.id,
      materialCode: part.material.code,
      materialName: part.material.name,
      unit: part.material.unit,
      lotId: part.lot.id,
      supplierLot: part.lot.supplierLot,
      quantityUsed: Number(m.quantityUsed),
      loadedAt: m.loadedAt.toISOString(),
    };
  };
  return runs.map((r) => ({
    id: r.id,
    batchId: r.batchId,
    stepId: r.stepId,
    stationId: r.stationId,
    driverId: r.driverId,
    serial: r.driverId ? (serial.get(r.driverId) ?? null) : null,
    kind: r.kind,
    startedAt: r.startedAt.toISOString(),
    finishedAt: iso(r.finishedAt),
    startedBy: r.startedBy,
    finishedBy: r.finishedBy,
    handlingAt: iso(r.handlingAt),
    cureCompleteAt: iso(r.cureCompleteAt),
    shortCure: r.shortCure,
    deviationId: r.deviationId,
    unitsDone: r.unitsDone,
    materials: mats.filter((m) => m.stepRunId === r.id).map(material),
    uv:
      r.uvDoseMJcm2 !== null && r.uvDoseNeededMJcm2 !== null
        ? {
            exposureSeconds: Number(r.exposureSeconds),
            irradianceMWcm2: Number(r.uvIrradianceMWcm2),
            doseMJcm2: Number(r.uvDoseMJcm2),
            neededMJcm2: Number(r.uvDoseNeededMJcm2),
          }
        : null,
  }));
}

export async function describeRun(tx: DbOrTx, runId: string): Promise<StepRun> {
  const [row] = await tx.select().from(stepRuns).where(eq(stepRuns.id, runId));
  const [run] = await describeRuns(tx, [row]);
  return run;
}
