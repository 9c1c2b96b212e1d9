import { and, eq, isNull } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { buildBatches, deviations, stationLoads, stepRunMaterials, stepRuns } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { StepRun } from '../../../shared/schemas/steps';
import { checkContainerUsable, checkMixUsable, containersByIds, mixesByIds } from '../loading';
import { describeRun } from './describe';
import { plantTime } from '../../plant-time';
import { formatRelative } from '../../../shared/plant-time';
import { claimableDeviation, openRun, recomputeCure, runToWaitFor, stepContext, type StepActionRequest, type StepContext } from './context';

/** The gate names the moment in plant time, with how long is left: "Thu 07:25, in 27 h 10 min". */
function when(iso: string, now: Date): string {
  return `${plantTime(iso, now)}, ${formatRelative(iso, now)}`;
}

/** Steps run in seq order: every earlier step needs a finished whole-batch run. */
function checkOrder(ctx: StepContext): void {
  const { step, progress } = ctx;
  if (ctx.driver) return; // a rework run redoes chosen steps on one unit
  const existing = progress.buildRuns.get(step.id);
  if (existing) {
    throw conflict(
      existing.finishedAt ? 'STEP_ALREADY_DONE' : 'STEP_ALREADY_STARTED',
      existing.finishedAt
        ? `Step "${step.name}" is already done for batch ${ctx.batch.code}. Scan the batch's next step.`
        : `Step "${step.name}" is already running for batch ${ctx.batch.code}; finish it instead.`,
      { stepRunId: existing.id },
    );
  }
  const waiting = progress.pending.find((s) => s.seq < step.seq);
  if (waiting) {
    throw conflict(
      'STEP_OUT_OF_ORDER',
      `Step "${waiting.name}" (step ${waiting.seq}) must be finished for batch ${ctx.batch.code} before "${step.name}" (step ${step.seq}) can start.`,
      { waitingStepId: waiting.id },
    );
  }
}

/**
 * The cure gate: the previous step's adhesive, when that step waits for cure, must be fully cured
 * (recomputed now from the readings). An unused early-start deviation lets the start go on, flagged short cure.
 */
async function cureGate(tx: Tx, ctx: StepContext, now: Date, actor: Actor): Promise<{ shortCure: boolean; deviationId: string | null }> {
  const prev = [...ctx.progress.steps].reverse().find((s) => s.seq < ctx.step.seq);
  if (!prev?.waitForCure) return { shortCure: false, deviationId: null };
  const prevRun = await runToWaitFor(tx, ctx, prev);
  if (!prevRun) return { shortCure: false, deviationId: null };
  const cure = await recomputeCure(tx, prevRun, now);
  if (!cure || (cure.cureCompleteAt !== null && Date.parse(cure.cureCompleteAt) <= now.getTime()))
    return { shortCure: false, deviationId: null };

  const deviation = await claimableDeviation(tx, ctx.batch.id, ctx.step.id, 'early_start');
  if (!deviation) {
    throw conflict(
      'CURE_INCOMPLETE',
      cure.cureCompleteAt === null
        ? `The adhesive of step "${prev.name}" is making no cure progress at the temperature recorded ${cure.environment === 'own' ? 'for its station (no oven reading, or too cold)' : 'in the area (below its minimum cure temperature)'}; it is not fully cured. Wait, or ask quality to record a deviation to start early.`
        : `The adhesive of step "${prev.name}" is not fully cured until ${when(cure.cureCompleteAt, now)} (${Math.floor(cure.progress * 100)} % now). Wait, or ask quality to record a deviation to start early.`,
      { cureCompleteAt: cure.cureCompleteAt, handlingAt: cure.handlingAt, stepRunId: prevRun.id, stepId: prev.id },
    );
  }
  await tx.update(deviations).set({ usedAt: now }).where(eq(deviations.id, deviation.id));
  await recordAudit(tx, {
    actorId: actor.id,
    action: 'deviation.use',
    entityType: 'deviation',
    entityId: deviation.id,
    before: { usedAt: null },
    after: { usedAt: now.toISOString(), cureCompleteAt: cure.cureCompleteAt },
  });
  return { shortCure: true, deviationId: deviation.id };
}

/** Everything loaded here for the batch must still be usable at the start (a lot may have been quarantined since). */
async function loadedNow(tx: Tx, ctx: StepContext, now: Date) {
  const loads = await tx
    .select()
    .from(stationLoads)
    .where(and(eq(stationLoads.stationId, ctx.station.id), eq(stationLoads.batchId, ctx.batch.id), isNull(stationLoads.unloadedAt)));
  const cs = await containersByIds(
    tx,
    loads.flatMap((l) => (l.containerId ? [l.containerId] : [])),
  );
  const ms = await mixesByIds(
    tx,
    loads.flatMap((l) => (l.mixId ? [l.mixId] : [])),
  );
  for (const c of cs.values()) checkContainerUsable(c.container, c.lot, c.material, now);
  for (const m of ms.values()) checkMixUsable(m.mix, [m.resin, m.hardener], now);
  return loads;
}

/**
 * Starts a recipe step for a batch (or, with `serial`, a single-unit rework run) at a station.
 * Exported for the rework endpoints.
 */
export async function startStep(actor: Actor, input: StepActionRequest, now: Date = new Date()): Promise<{ stepRun: StepRun }> {
  requirePermission(actor, 'steps.run');
  return db.transaction(async (tx) => {
    const ctx = await stepContext(tx, input);
    checkOrder(ctx);
    if (ctx.driver && (await openRun(tx, ctx))) {
      throw conflict(
        'STEP_ALREADY_STARTED',
        `Step "${ctx.step.name}" is already running for driver ${ctx.driver.serial}; finish it instead.`,
      );
    }
    const gate = await cureGate(tx, ctx, now, actor);
    const loads = await loadedNow(tx, ctx, now);

    const [run] = await tx
      .insert(stepRuns)
      .values({
        batchId: ctx.batch.id,
        stepId: ctx.step.id,
        stationId: ctx.station.id,
        driverId: ctx.driver?.id ?? null,
        kind: ctx.driver ? 'rework' : 'build',
        startedAt: now,
        startedBy: actor.id,
        shortCure: gate.shortCure,
        deviationId: gate.deviationId,
      })
      .returning();
    if (loads.length) {
      await tx
        .insert(stepRunMaterials)
        .values(
          loads.map((l) => ({ stepRunId: run.id, containerId: l.containerId, mixId: l.mixId, loadedAt: l.loadedAt, loadedBy: l.loadedBy })),
        );
    }
    if (ctx.batch.status === 'open') {
      await tx.update(buildBatches).set({ status: 'in_process' }).where(eq(buildBatches.id, ctx.batch.id));
      await recordAudit(tx, {
        actorId: actor.id,
        action: 'batch.status',
        entityType: 'build_batch',
        entityId: ctx.batch.id,
        before: { status: 'open' },
        after: { status: 'in_process' },
      });
    }
    const stepRun = await describeRun(tx, run.id);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'step.start',
      entityType: 'step_run',
      entityId: run.id,
      after: stepRun,
      reason: gate.shortCure ? 'started before full cure under a quality deviation' : null,
    });
    return { stepRun };
  });
}
