import { and, eq, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { stationLoads, stepRunMaterials, stepRuns } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { StepRun } from '../../../shared/schemas/steps';
import { profilesForRuns, cureOfRun } from '../cure/compute';
import { consumeForRun } from './consume';
import { describeRun } from './describe';
import { openRun, stepContext, type StepActionRequest } from './context';

/**
 * Finishes a running step: records what was consumed (amountPerUnit × units, FEFO across what is
 * loaded) and starts the cure clock from the area's readings. Exported for the rework endpoints,
 * which pass their own transaction (`runner`) so the finish and what follows commit together.
 */
export async function finishStep(
  actor: Actor,
  input: StepActionRequest,
  now: Date = new Date(),
  runner: DbOrTx = db,
): Promise<{ stepRun: StepRun }> {
  requirePermission(actor, 'steps.run');
  return runner.transaction(async (tx) => {
    const ctx = await stepContext(tx, input);
    const run = await openRun(tx, ctx);
    if (!run) {
      const who = ctx.driver ? `driver ${ctx.driver.serial}` : `batch ${ctx.batch.code}`;
      throw conflict('STEP_NOT_STARTED', `Step "${ctx.step.name}" is not running for ${who}; start it first.`);
    }
    if (run.stationId !== ctx.station.id) {
      throw conflict('WRONG_STATION', `Step "${ctx.step.name}" was started at another station; finish it there.`, { stationId: run.stationId });
    }
    if (now < run.startedAt) throw conflict('CLOCK_BEHIND', 'The finish time is before the start time; check the station clock.');

    // Anything loaded here for the batch since the start was used by this run too.
    const loads = await tx
      .select()
      .from(stationLoads)
      .where(and(eq(stationLoads.stationId, ctx.station.id), eq(stationLoads.batchId, ctx.batch.id), isNull(stationLoads.unloadedAt)));
    const known = await tx.select().from(stepRunMaterials).where(eq(stepRunMaterials.stepRunId, run.id));
    const missing = loads.filter((l) => !known.some((k) => (l.containerId ? k.containerId === l.containerId : k.mixId === l.mixId)));
    if (missing.length) {
      await tx.insert(stepRunMaterials).values(
        missing.map((l) => ({ stepRunId: run.id, containerId: l.containerId, mixId: l.mixId, loadedAt: l.loadedAt, loadedBy: l.loadedBy })),
      );
    }

    const units = ctx.driver ? 1 : ctx.batch.quantity;
    await consumeForRun(tx, actor, run.id, ctx.step, units, ctx.batch.code, now);

    const profiles = (await profilesForRuns(tx, [run.id])).get(run.id) ?? [];
    const cure = await cureOfRun(tx, { finishedAt: now, area: ctx.station.area, stationId: ctx.station.id }, profiles, now);
    await tx
      .update(stepRuns)
      .set({
        finishedAt: now,
        finishedBy: actor.id,
        unitsDone: units,
        handlingAt: cure?.handlingAt ? new Date(cure.handlingAt) : null,
        cureCompleteAt: cure?.cureCompleteAt ? new Date(cure.cureCompleteAt) : null,
      })
      .where(eq(stepRuns.id, run.id));
    const stepRun = await describeRun(tx, run.id);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'step.finish',
      entityType: 'step_run',
      entityId: run.id,
      before: { finishedAt: null },
      after: stepRun,
    });
    return { stepRun };
  });
}
