import { asc, eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { recipeSteps, stations, stepRuns } from '../../db/schema';
import type { DriverDetail, DriverRun } from '../../../shared/schemas/drivers';
import { testHistory } from '../testing/records';
import { findDriverWithBatch } from './lookup';

/** Runs on this driver alone (rework), oldest first. */
export async function driverRuns(driverId: string): Promise<DriverRun[]> {
  const rows = await db
    .select({
      stepRunId: stepRuns.id,
      stepId: stepRuns.stepId,
      stepName: recipeSteps.name,
      seq: recipeSteps.seq,
      kind: stepRuns.kind,
      stationId: stepRuns.stationId,
      stationCode: stations.code,
      startedAt: stepRuns.startedAt,
      finishedAt: stepRuns.finishedAt,
    })
    .from(stepRuns)
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .innerJoin(stations, eq(stations.id, stepRuns.stationId))
    .where(eq(stepRuns.driverId, driverId))
    .orderBy(asc(stepRuns.startedAt), asc(recipeSteps.seq));
  return rows.map((r) => ({ ...r, startedAt: r.startedAt.toISOString(), finishedAt: r.finishedAt?.toISOString() ?? null }));
}

/** GET /api/drivers/:serial — the driver, its batch and model, test history and rework runs. */
export async function getDriver(serial: string): Promise<DriverDetail> {
  const { driver, batch } = await findDriverWithBatch(db, serial);
  const [tests, reworkRuns] = await Promise.all([testHistory(db, driver.id), driverRuns(driver.id)]);
  return {
    driver,
    batch,
    model: { id: batch.modelId, code: batch.modelCode, name: batch.modelName },
    tests,
    reworkRuns,
  };
}
