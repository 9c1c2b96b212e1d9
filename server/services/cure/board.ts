import { and, desc, eq, gte, inArray, isNotNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { buildBatches, driverModels, drivers, recipeSteps, stations, stepRuns } from '../../db/schema';
import type { CureItem, CureList } from '../../../shared/schemas/cure';
import { findBatch } from '../batches/read';
import { cureOfRun, profilesForRuns } from './compute';
import { stepCureMethod, type MethodCureProfile } from '../../../shared/cure-methods';

/** Cures older than this are not looked at by the board (a cure of a week is far beyond any adhesive here). */
const BOARD_LOOKBACK_DAYS = 14;

/**
 * Recomputes the cure of finished runs from the readings recorded since, and keeps those a
 * person waits on: still curing, or a wait-for-cure step whose next step has not started.
 */
async function cureItems(tx: DbOrTx, where: ReturnType<typeof and>, now: Date, includeAll: boolean): Promise<CureItem[]> {
  const rows = await tx
    .select({
      run: stepRuns,
      batchCode: buildBatches.code,
      batchStatus: buildBatches.status,
      modelId: buildBatches.modelId,
      modelCode: driverModels.code,
      step: recipeSteps,
      stationCode: stations.code,
      area: stations.area,
      serial: drivers.serial,
    })
    .from(stepRuns)
    .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
    .innerJoin(driverModels, eq(driverModels.id, buildBatches.modelId))
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .innerJoin(stations, eq(stations.id, stepRuns.stationId))
    .leftJoin(drivers, eq(drivers.id, stepRuns.driverId))
    .where(and(where, isNotNull(stepRuns.finishedAt), isNotNull(stepRuns.cureCompleteAt)))
    .orderBy(desc(stepRuns.finishedAt));
  if (rows.length === 0) return [];
  const profiles = await profilesForRuns(
    tx,
    rows.map((r) => r.run.id),
  );
  const modelIds = [...new Set(rows.map((r) => r.modelId))];
  const allSteps = await tx.select().from(recipeSteps).where(inArray(recipeSteps.modelId, modelIds));
  const batchIds = [...new Set(rows.map((r) => r.run.batchId))];
  const later = await tx
    .select({ batchId: stepRuns.batchId, stepId: stepRuns.stepId, driverId: stepRuns.driverId, startedAt: stepRuns.startedAt })
    .from(stepRuns)
    .where(inArray(stepRuns.batchId, batchIds));

  const items: CureItem[] = [];
  for (const r of rows) {
    const cure = await cureOfRun(
      tx,
      { finishedAt: r.run.finishedAt!, area: r.area, stationId: r.run.stationId },
      profiles.get(r.run.id) ?? [],
      now,
    );
    if (!cure) continue;
    const next = allSteps.filter((s) => s.modelId === r.modelId && s.seq > r.step.seq).sort((a, b) => a.seq - b.seq)[0] ?? null;
    const nextStarted = next
      ? later.some(
          (l) => l.batchId === r.run.batchId && l.stepId === next.id && l.driverId === r.run.driverId && l.startedAt >= r.run.finishedAt!,
        )
      : true;
    const ready = cure.cureCompleteAt !== null && Date.parse(cure.cureCompleteAt) <= now.getTime();
    const waitedOn = r.step.waitForCure && !nextStarted && r.batchStatus !== 'cancelled';
    if (!includeAll && ready && !waitedOn) continue;
    items.push({
      stepRunId: r.run.id,
      batchId: r.run.batchId,
      batchCode: r.batchCode,
      modelCode: r.modelCode,
      stepId: r.step.id,
      stepName: r.step.name,
      seq: r.step.seq,
      kind: r.run.kind,
      serial: r.serial ?? null,
      waitForCure: r.step.waitForCure,
      stationId: r.run.stationId,
      stationCode: r.stationCode,
      area: r.area,
      finishedAt: r.run.finishedAt!.toISOString(),
      handlingAt: cure.handlingAt,
      cureCompleteAt: cure.cureCompleteAt,
      progress: cure.progress,
      cureEnvironment: cure.environment,
      cureMethod: stepCureMethod((profiles.get(r.run.id) ?? []) as MethodCureProfile[]),
      uv:
        r.run.uvDoseMJcm2 !== null && r.run.uvDoseNeededMJcm2 !== null
          ? {
              exposureSeconds: Number(r.run.exposureSeconds),
              irradianceMWcm2: Number(r.run.uvIrradianceMWcm2),
              doseMJcm2: Number(r.run.uvDoseMJcm2),
              neededMJcm2: Number(r.run.uvDoseNeededMJcm2),
            }
          : null,
      ready,
      nextStep: next ? { id: next.id, seq: next.seq, name: next.name } : null,
    });
  }
  // A cure making no progress (null) sorts last.
  const key = (i: CureItem) => (i.cureCompleteAt === null ? Number.POSITIVE_INFINITY : Date.parse(i.cureCompleteAt));
  return items.sort((a, b) => key(a) - key(b));
}

/** GET /api/batches/:id/cure: every timed cure of the batch, recomputed now. */
export async function batchCure(batchId: string, now: Date = new Date()): Promise<CureList> {
  await findBatch(db, batchId);
  return { items: await cureItems(db, and(eq(stepRuns.batchId, batchId)), now, true), now: now.toISOString() };
}

/** GET /api/cure/board: every batch curing, or waiting on a cure, with ready times. */
export async function cureBoard(query: { area?: string }, now: Date = new Date()): Promise<CureList> {
  const since = new Date(now.getTime() - BOARD_LOOKBACK_DAYS * 86_400_000);
  const where = and(gte(stepRuns.finishedAt, since), query.area ? eq(stations.area, query.area) : undefined);
  return { items: await cureItems(db, where, now, false), now: now.toISOString() };
}
