import { and, eq, isNull } from 'drizzle-orm';
import { db } from '../../db/client';
import { drivers, stepRuns } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import type { DriverResult, ScrapInput } from '../../../shared/schemas/drivers';
import { toDriver } from './lookup';

/** POST /api/drivers/:serial/scrap (quality): the unit is taken out for good, with the reason. */
export async function scrapDriver(actor: Actor, serial: string, input: ScrapInput): Promise<DriverResult> {
  requirePermission(actor, 'drivers.scrap');
  return db.transaction(async (tx) => {
    const [driver] = await tx.select().from(drivers).where(eq(drivers.serial, serial)).for('update');
    if (!driver) throw notFound(`Driver ${serial}`);
    if (driver.status === 'scrapped') throw conflict('ALREADY_SCRAPPED', `Driver ${serial} is already scrapped.`);
    const [open] = await tx
      .select({ id: stepRuns.id })
      .from(stepRuns)
      .where(and(eq(stepRuns.driverId, driver.id), isNull(stepRuns.finishedAt)))
      .limit(1);
    if (open) throw conflict('REWORK_IN_PROGRESS', `Driver ${serial} has a rework step still running; finish it first.`);
    const [after] = await tx.update(drivers).set({ status: 'scrapped' }).where(eq(drivers.id, driver.id)).returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'driver.scrap',
      entityType: 'driver',
      entityId: driver.id,
      before: { status: driver.status },
      after: { status: after.status },
      reason: input.reason,
    });
    return { driver: toDriver(after) };
  });
}
