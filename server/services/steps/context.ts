import { and, asc, desc, eq, isNotNull, isNull } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { deviations, drivers, stations, stepRuns } from '../../db/schema';
import { AppError, conflict } from '../../errors';
import type { RecipeStep } from '../../../shared/schemas/models';
import { findStation } from '../stations';
import { findBatch } from '../batches/read';
import { batchProgress, checkBatchOpen, type BatchProgress } from '../batches/progress';
import { profilesForRuns, cureOfRun, type RunCure } from '../cure/compute';
import type { StepRunRow } from './describe';
import { stationKindWords } from '../../../shared/words';

/** What startStep / finishStep take: the batch's recipe step at a station; a serial makes it a single-unit rework run. */
export interface StepActionRequest {
  batchId: string;
  stepId: string;
  stationId: string;
  serial?: string;
  /** Finish of a UV step: exposure under the lamp, seconds. */
  exposureSeconds?: number;
}

export interface StepContext {
  station: Awaited<ReturnType<typeof findStation>>;
  batch: Awaited<ReturnType<typeof findBatch>>['row'];
  progress: BatchProgress;
  step: RecipeStep;
  driver: typeof drivers.$inferSelect | null;
}

/** Resolves and locks the batch (one start/finish per batch at a time), checks station and step. */
export async function stepContext(tx: Tx, input: StepActionRequest): Promise<StepContext> {
  const station = await findStation(tx, input.stationId);
  if (!station.active) throw conflict('STATION_RETIRED', `Station ${station.code} is retired; run the step at an active station.`);
  const { row: batch } = await findBatch(tx, input.batchId, true);
  checkBatchOpen(batch, Boolean(input.serial));
  const progress = await batchProgress(tx, batch);
  const step = progress.steps.find((s) => s.id === input.stepId);
  if (!step)
    throw new AppError('NOT_FOUND', `That step is not in the recipe of batch ${batch.code}.`, 404, [
      { field: 'stepId', message: 'is not a step of this batch' },
    ]);
  if (station.kind !== step.stationKind) {
    throw conflict(
      'WRONG_STATION',
      `Step "${step.name}" runs at a ${stationKindWords(step.stationKind).toLowerCase()} station; ${station.code} is a ${stationKindWords(station.kind).toLowerCase()} station. Go to the right station.`,
      { stationKind: station.kind, stepStationKind: step.stationKind },
    );
  }
  let driver: StepContext['driver'] = null;
  if (input.serial) {
    [driver] = await tx.select().from(drivers).where(eq(drivers.serial, input.serial));
    if (!driver)
      throw new AppError('NOT_FOUND', `No driver has the serial "${input.serial}".`, 404, [{ field: 'serial', message: 'is not known' }]);
    if (driver.batchId !== batch.id) {
      throw conflict('WRONG_BATCH', `Driver ${driver.serial} belongs to another batch, not ${batch.code}. Scan the driver's own batch.`);
    }
  }
  return { station, batch, progress, step, driver };
}

/** The latest finished run of a step that a start must wait for (this unit's rework run first, else the batch run). */
export async function runToWaitFor(tx: Tx, ctx: StepContext, prev: RecipeStep): Promise<StepRunRow | null> {
  if (ctx.driver) {
    const [rework] = await tx
      .select()
      .from(stepRuns)
      .where(and(eq(stepRuns.driverId, ctx.driver.id), eq(stepRuns.stepId, prev.id), isNotNull(stepRuns.finishedAt)))
      .orderBy(desc(stepRuns.finishedAt))
      .limit(1);
    if (rework) return rework;
  }
  const build = ctx.progress.buildRuns.get(prev.id);
  return build?.finishedAt ? build : null;
}

/** Cure of a finished run recomputed now from its station area's readings. */
export async function recomputeCure(tx: Tx, run: StepRunRow, now: Date): Promise<RunCure | null> {
  if (!run.finishedAt) return null;
  const [st] = await tx.select({ area: stations.area }).from(stations).where(eq(stations.id, run.stationId));
  const profiles = (await profilesForRuns(tx, [run.id])).get(run.id) ?? [];
  return cureOfRun(tx, { finishedAt: run.finishedAt, area: st.area, stationId: run.stationId }, profiles, now);
}

/** The open (unfinished) run of this step for the batch or the unit, locked. */
export async function openRun(tx: Tx, ctx: StepContext): Promise<StepRunRow | null> {
  const [run] = await tx
    .select()
    .from(stepRuns)
    .where(
      and(
        eq(stepRuns.batchId, ctx.batch.id),
        eq(stepRuns.stepId, ctx.step.id),
        ctx.driver ? eq(stepRuns.driverId, ctx.driver.id) : isNull(stepRuns.driverId),
        isNull(stepRuns.finishedAt),
      ),
    )
    .for('update');
  return run ?? null;
}

/**
 * The oldest unused deviation of `kind` that quality signed for this batch step, locked so two
 * requests cannot both use it (early start before full cure, a short UV dose, …); undefined when none.
 */
export async function claimableDeviation(tx: Tx, batchId: string, stepId: string, kind: string) {
  const [deviation] = await tx
    .select()
    .from(deviations)
    .where(and(eq(deviations.batchId, batchId), eq(deviations.stepId, stepId), eq(deviations.kind, kind), isNull(deviations.usedAt)))
    .orderBy(asc(deviations.signedAt))
    .limit(1)
    .for('update');
  return deviation;
}
