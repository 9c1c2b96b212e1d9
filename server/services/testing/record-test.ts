import { and, eq, isNull, sql } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { defectCodes, drivers, stepRuns, testResults } from '../../db/schema';
import { conflict, fieldError, notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import type { TestCreated, TestInput } from '../../../shared/schemas/tests';
import { toTestRecord } from './records';
import { cureOfRun, profilesForRuns } from '../cure';
import { plantTime } from '../../plant-time';

interface MissingStep {
  step_id: string;
  seq: number;
  name: string;
}

/**
 * Recipe steps of the driver's model not yet finished for this driver. A step counts as done
 * when a whole-batch run of its batch finished, or a single-unit run (rework) on it finished.
 */
export async function missingSteps(tx: Tx, batchId: string, driverId: string): Promise<MissingStep[]> {
  const res = await tx.execute(sql`
    SELECT rs.id AS step_id, rs.seq, rs.name
    FROM build_batches b
    JOIN recipe_steps rs ON rs.model_id = b.model_id
    WHERE b.id = ${batchId}
      AND NOT EXISTS (
        SELECT 1 FROM step_runs sr
        WHERE sr.step_id = rs.id AND sr.finished_at IS NOT NULL
          AND ((sr.batch_id = b.id AND sr.driver_id IS NULL AND sr.kind = 'build') OR sr.driver_id = ${driverId})
      )
    ORDER BY rs.seq`);
  return res.rows as unknown as MissingStep[];
}

/** When the adhesive of the recipe's last step (if it must cure) is fully cured for this driver; null if nothing to wait for. */
async function lastStepCureCompleteAt(tx: Tx, batchId: string, driverId: string, now: Date): Promise<Date | null> {
  const res = await tx.execute(sql`
    SELECT sr.id, sr.finished_at, st.area, sr.station_id
    FROM build_batches b
    JOIN LATERAL (SELECT id, wait_for_cure FROM recipe_steps WHERE model_id = b.model_id ORDER BY seq DESC LIMIT 1) last ON true
    JOIN step_runs sr ON sr.step_id = last.id AND sr.finished_at IS NOT NULL
      AND ((sr.batch_id = b.id AND sr.driver_id IS NULL) OR sr.driver_id = ${driverId})
    JOIN stations st ON st.id = sr.station_id
    WHERE b.id = ${batchId} AND last.wait_for_cure`);
  const runs = res.rows as { id: string; finished_at: Date | string; area: string; station_id: string }[];
  // The same computation as the station's start gate and the cure board: recomputed from the
  // area's readings since the finish, not the estimate stored at finish.
  const profiles = await profilesForRuns(
    tx,
    runs.map((r) => r.id),
  );
  let latest: Date | null = null;
  for (const r of runs) {
    const cure = await cureOfRun(
      tx,
      { finishedAt: new Date(r.finished_at), area: r.area, stationId: r.station_id },
      profiles.get(r.id) ?? [],
      now,
    );
    // A cure making no progress (an oven with no reading) is not complete: it holds the test.
    const at = cure ? (cure.cureCompleteAt ? new Date(cure.cureCompleteAt) : new Date(8.64e15)) : null;
    if (at && (!latest || at > latest)) latest = at;
  }
  return latest;
}

/** POST /api/tests: record one final test; pass → passed, fail → failed (with a defect code). */
export async function recordTest(actor: Actor, input: TestInput): Promise<TestCreated> {
  requirePermission(actor, 'tests.record');
  return db.transaction(async (tx) => {
    const [driver] = await tx.select().from(drivers).where(eq(drivers.serial, input.serial)).for('update');
    if (!driver) throw notFound(`Driver ${input.serial}`);
    if (driver.status === 'scrapped') {
      throw conflict('DRIVER_SCRAPPED', `Driver ${driver.serial} was scrapped; it cannot be tested.`);
    }
    let defectDescription: string | null = null;
    if (input.defectCode) {
      const [code] = await tx.select().from(defectCodes).where(eq(defectCodes.code, input.defectCode));
      if (!code) throw fieldError('defectCode', `${input.defectCode} is not a known defect code`);
      if (!code.active) throw fieldError('defectCode', `${input.defectCode} is no longer in use; pick an active code`);
      defectDescription = code.description;
    }
    const [openRework] = await tx
      .select({ id: stepRuns.id })
      .from(stepRuns)
      .where(and(eq(stepRuns.driverId, driver.id), isNull(stepRuns.finishedAt)))
      .limit(1);
    if (openRework) {
      throw conflict('REWORK_IN_PROGRESS', `Driver ${driver.serial} has a rework step still running; finish it before testing.`);
    }
    const missing = await missingSteps(tx, driver.batchId, driver.id);
    if (missing.length > 0) {
      throw conflict(
        'STEPS_INCOMPLETE',
        `Driver ${driver.serial} has not finished every build step (missing: ${missing.map((m) => `${m.seq} ${m.name}`).join(', ')}).`,
        missing.map((m) => ({ stepId: m.step_id, seq: m.seq, name: m.name })),
      );
    }
    const now = new Date();
    const cureAt = await lastStepCureCompleteAt(tx, driver.batchId, driver.id, now);
    if (cureAt && cureAt > now) {
      throw conflict('CURE_INCOMPLETE', `The last step's adhesive is not fully cured until ${plantTime(cureAt)}; test after that.`, {
        cureCompleteAt: cureAt.toISOString(),
      });
    }

    const [test] = await tx
      .insert(testResults)
      .values({
        driverId: driver.id,
        result: input.result,
        defectCode: input.defectCode ?? null,
        measurements: input.measurements ?? null,
        testedBy: actor.id,
      })
      .returning();
    const status = input.result === 'pass' ? 'passed' : 'failed';
    await tx.update(drivers).set({ status }).where(eq(drivers.id, driver.id));
    await recordAudit(tx, { actorId: actor.id, action: 'test.record', entityType: 'test_result', entityId: test.id, after: test });
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'driver.status',
      entityType: 'driver',
      entityId: driver.id,
      before: { status: driver.status },
      after: { status },
      reason: `final test ${input.result}`,
    });
    return {
      test: toTestRecord({ ...test, defectDescription, testedByName: actor.name }),
      driver: { id: driver.id, serial: driver.serial, status, previousStatus: driver.status },
    };
  });
}
