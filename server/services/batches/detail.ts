import { and, asc, eq, inArray, isNotNull } from 'drizzle-orm';
import { db } from '../../db/client';
import { drivers, materials, stations, stepRuns } from '../../db/schema';
import type { BatchDetail, TravelerStep } from '../../../shared/schemas/batches';
import { describeRuns } from '../steps/describe';
import { cureOfRun, profilesForRuns } from '../cure/compute';
import { findBatch } from './read';
import { batchProgress } from './progress';

/** GET /api/batches/:id — the traveler: every step with its state, run and cure (recomputed now). */
export async function getBatchDetail(id: string, now: Date = new Date()): Promise<BatchDetail> {
  const { row, batch } = await findBatch(db, id);
  const progress = await batchProgress(db, row);
  const materialIds = [...new Set(progress.steps.flatMap((s) => s.materials.map((m) => m.materialId)))];
  const mats = materialIds.length
    ? await db
        .select({
          id: materials.id,
          code: materials.code,
          name: materials.name,
          unit: materials.unit,
          partnerMaterialId: materials.partnerMaterialId,
        })
        .from(materials)
        .where(inArray(materials.id, materialIds))
    : [];
  const buildRunRows = [...progress.buildRuns.values()];
  const reworkRows = await db
    .select()
    .from(stepRuns)
    .where(and(eq(stepRuns.batchId, row.id), isNotNull(stepRuns.driverId)))
    .orderBy(asc(stepRuns.startedAt));
  const [buildRuns, reworkRuns] = await Promise.all([describeRuns(db, buildRunRows), describeRuns(db, reworkRows)]);
  const profiles = await profilesForRuns(
    db,
    buildRunRows.filter((r) => r.finishedAt).map((r) => r.id),
  );
  const areas = new Map(
    buildRunRows.length
      ? (
          await db
            .select({ id: stations.id, area: stations.area })
            .from(stations)
            .where(
              inArray(
                stations.id,
                buildRunRows.map((r) => r.stationId),
              ),
            )
        ).map((s) => [s.id, s.area])
      : [],
  );

  const steps: TravelerStep[] = [];
  for (const s of progress.steps) {
    const runRow = progress.buildRuns.get(s.id);
    const run = buildRuns.find((r) => r.stepId === s.id) ?? null;
    let state: TravelerStep['state'] = 'pending';
    let handlingAt: string | null = null;
    let cureCompleteAt: string | null = null;
    if (runRow && !runRow.finishedAt) state = 'running';
    if (runRow?.finishedAt) {
      const cure = await cureOfRun(
        db,
        { finishedAt: runRow.finishedAt, area: areas.get(runRow.stationId) ?? '', stationId: runRow.stationId },
        profiles.get(runRow.id) ?? [],
        now,
      );
      handlingAt = cure?.handlingAt ?? null;
      cureCompleteAt = cure?.cureCompleteAt ?? null;
      state = cure && (cure.cureCompleteAt === null || Date.parse(cure.cureCompleteAt) > now.getTime()) ? 'curing' : 'done';
    }
    steps.push({
      id: s.id,
      seq: s.seq,
      name: s.name,
      stationKind: s.stationKind,
      waitForCure: s.waitForCure,
      materials: s.materials.map((m) => {
        const mat = mats.find((x) => x.id === m.materialId);
        return {
          materialId: m.materialId,
          materialCode: mat?.code ?? '',
          materialName: mat?.name ?? '',
          unit: mat?.unit ?? '',
          amountPerUnit: m.amountPerUnit,
          twoPart: !!mat?.partnerMaterialId,
        };
      }),
      state,
      run,
      handlingAt,
      cureCompleteAt,
    });
  }
  const driverRows = await db
    .select({ id: drivers.id, serial: drivers.serial, status: drivers.status })
    .from(drivers)
    .where(eq(drivers.batchId, row.id))
    .orderBy(asc(drivers.serial));
  return { batch, steps, currentStepId: progress.pending[0]?.id ?? null, drivers: driverRows, reworkRuns };
}
