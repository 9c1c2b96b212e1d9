import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { drivers } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import { finishStep, startStep } from '../steps';
import type { DriverStatus } from '../../../shared/constants';
import type { ReworkInput, ReworkResult } from '../../../shared/schemas/drivers';
import { toDriver } from './lookup';

/** A failed unit, or one reworked and not yet re-tested (a rebuild may redo several steps). */
const REWORKABLE: readonly DriverStatus[] = ['failed', 'reworked'];

async function reworkableDriver(serial: string) {
  const [driver] = await db.select().from(drivers).where(eq(drivers.serial, serial));
  if (!driver) throw notFound(`Driver ${serial}`);
  if (!REWORKABLE.includes(driver.status)) {
    throw conflict(
      'NOT_REWORKABLE',
      `Driver ${serial} is ${driver.status.replace('_', ' ')}; only a driver that failed final test can be reworked.`,
      { status: driver.status },
    );
  }
  return driver;
}

/** POST /api/drivers/:serial/rework/start — a single-unit run of one recipe step (steps module, kind 'rework'). */
export async function startRework(actor: Actor, serial: string, input: ReworkInput): Promise<ReworkResult> {
  requirePermission(actor, 'drivers.rework');
  const driver = await reworkableDriver(serial);
  const { stepRun } = await startStep(actor, { batchId: driver.batchId, stepId: input.stepId, stationId: input.stationId, serial });
  return { driver: toDriver(driver), stepRun };
}

/**
 * POST /api/drivers/:serial/rework/finish — finishes the unit's run (consumption and cure are the
 * steps module's) and marks the driver reworked; it goes back to final test.
 */
export async function finishRework(actor: Actor, serial: string, input: ReworkInput): Promise<ReworkResult> {
  requirePermission(actor, 'drivers.rework');
  const current = await reworkableDriver(serial);
  // The finish (a savepoint inside this transaction) and the status change commit together.
  return db.transaction(async (tx) => {
    const { stepRun } = await finishStep(
      actor,
      { batchId: current.batchId, stepId: input.stepId, stationId: input.stationId, serial },
      new Date(),
      tx,
    );
    const [before] = await tx.select().from(drivers).where(eq(drivers.serial, serial)).for('update');
    // Only failed → reworked: already reworked stays, and a concurrent scrap is not undone.
    if (before.status !== 'failed') return { driver: toDriver(before), stepRun };
    const [after] = await tx.update(drivers).set({ status: 'reworked' }).where(eq(drivers.id, before.id)).returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'driver.status',
      entityType: 'driver',
      entityId: before.id,
      before: { status: before.status },
      after: { status: after.status },
      reason: `rework run ${stepRun.id} finished`,
    });
    return { driver: toDriver(after), stepRun };
  });
}
