import { and, desc, eq, isNotNull, isNull, lte } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { deviations, readings, stationLoads, stepRunMaterials, stepRuns } from '../../db/schema';
import { conflict, fieldError } from '../../errors';
import { uvDose, type MethodCureProfile } from '../../../shared/cure-methods';
import type { CureProfile } from '../../../shared/cure';
import type { Tx } from '../../db/client';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { StepRun } from '../../../shared/schemas/steps';
import { profilesForRuns, cureOfRun } from '../cure/compute';
import { consumeForRun } from './consume';
import { describeRun } from './describe';
import { claimableDeviation, openRun, stepContext, type StepActionRequest } from './context';

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
      throw conflict('WRONG_STATION', `Step "${ctx.step.name}" was started at another station; finish it there.`, {
        stationId: run.stationId,
      });
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
        missing.map((l) => ({
          stepRunId: run.id,
          containerId: l.containerId,
          mixId: l.mixId,
          loadedAt: l.loadedAt,
          loadedBy: l.loadedBy,
        })),
      );
    }

    const units = ctx.driver ? 1 : ctx.batch.quantity;
    await consumeForRun(tx, actor, run.id, ctx.step, units, ctx.batch.code, now);
    // After consumption (profiles come from what the run drew); a refusal rolls it all back.
    const uv = await uvDoseCheck(tx, actor, ctx, run.id, input.exposureSeconds, now);

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
        ...(uv
          ? {
              exposureSeconds: String(uv.exposureSeconds),
              uvIrradianceMWcm2: String(uv.irradianceMWcm2),
              uvDoseMJcm2: String(Math.round(uv.doseMJcm2 * 10) / 10),
              uvDoseNeededMJcm2: String(uv.neededMJcm2),
            }
          : {}),
      })
      .where(eq(stepRuns.id, run.id));
    const stepRun = await describeRun(tx, run.id);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'step.finish',
      entityType: 'step_run',
      entityId: run.id,
      before: { finishedAt: null },
      after: uv ? { ...stepRun, uv } : stepRun,
    });
    return { stepRun };
  });
}

interface UvRecord {
  exposureSeconds: number;
  irradianceMWcm2: number;
  irradianceAt: string;
  doseMJcm2: number;
  neededMJcm2: number;
  deviationId: string | null;
}

/**
 * A UV-curing adhesive is cured by its dose (shared/cure-methods.ts): irradiance from the
 * station's latest radiometer reading × the exposure the assembler gives at the finish. Short of
 * the adhesive's dose (or with no radiometer reading), the finish is refused (409 UV_DOSE_LOW)
 * unless quality signed an unused 'uv_dose_low' deviation for this batch and step.
 */
async function uvDoseCheck(
  tx: Tx,
  actor: Actor,
  ctx: Awaited<ReturnType<typeof stepContext>>,
  runId: string,
  exposureSeconds: number | undefined,
  now: Date,
): Promise<UvRecord | null> {
  const profiles = ((await profilesForRuns(tx, [runId])).get(runId) ?? []) as (CureProfile & MethodCureProfile)[];
  const uvProfiles = profiles.filter((p) => p.method === 'uv' && typeof p.uvDoseMJcm2 === 'number');
  if (uvProfiles.length === 0) return null;
  if (exposureSeconds === undefined)
    throw fieldError('exposureSeconds', 'is required: the adhesive of this step cures under UV light, by dose');
  const needed = Math.max(...uvProfiles.map((p) => p.uvDoseMJcm2 as number));
  const [lamp] = await tx
    .select({ at: readings.at, irr: readings.irradianceMWcm2 })
    .from(readings)
    .where(and(eq(readings.stationId, ctx.station.id), isNotNull(readings.irradianceMWcm2), lte(readings.at, now)))
    .orderBy(desc(readings.at), desc(readings.createdAt))
    .limit(1);
  const irradiance = lamp ? Number(lamp.irr) : 0;
  const dose = uvDose(irradiance, exposureSeconds);
  const record: UvRecord = {
    exposureSeconds,
    irradianceMWcm2: irradiance,
    irradianceAt: lamp ? lamp.at.toISOString() : '',
    doseMJcm2: dose,
    neededMJcm2: needed,
    deviationId: null,
  };
  if (lamp && dose >= needed) return record;

  const deviation = await claimableDeviation(tx, ctx.batch.id, ctx.step.id, 'uv_dose_low');
  if (!deviation) {
    const fmt = (n: number) => String(Math.round(n)).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
    throw conflict(
      'UV_DOSE_LOW',
      lamp
        ? `The UV dose reached is ${fmt(dose)} mJ/cm² (${irradiance} mW/cm² × ${exposureSeconds} s); the adhesive needs ${fmt(needed)} mJ/cm². Expose longer (at least ${Math.ceil(needed / irradiance)} s at this lamp), check the lamp, or ask quality to record a deviation.`
        : `No radiometer reading is recorded for the lamp of station ${ctx.station.code}, so the dose reached is unknown (0 mJ/cm² counted); the adhesive needs ${fmt(needed)} mJ/cm². Measure the lamp and record its reading, or ask quality to record a deviation.`,
      { doseMJcm2: dose, neededMJcm2: needed, irradianceMWcm2: lamp ? irradiance : null, exposureSeconds },
    );
  }
  await tx.update(deviations).set({ usedAt: now }).where(eq(deviations.id, deviation.id));
  await recordAudit(tx, {
    actorId: actor.id,
    action: 'deviation.use',
    entityType: 'deviation',
    entityId: deviation.id,
    before: { usedAt: null },
    after: { usedAt: now.toISOString(), doseMJcm2: dose, neededMJcm2: needed },
  });
  return { ...record, deviationId: deviation.id };
}
