import { and, count, eq, like, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db } from '../../db/client';
import { buildBatches, driverModels, drivers, recipeSteps } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { findModelRow } from '../models';
import type { BatchCreated, BatchInput } from '../../../shared/schemas/batches';
import { revisionLabel } from '../../../shared/schemas/models';
import { toBatch } from './read';
import { config } from '../../config';

/** <batch code>-<unit, 4 digits>: readable on a label and unique because the batch code is. */
export function serialFor(batchCode: string, unit: number): string {
  return `${batchCode}-${String(unit).padStart(4, '0')}`;
}

/** Opens a build batch of one model and numbers its drivers. */
export async function createBatch(actor: Actor, input: BatchInput, now: Date = new Date()): Promise<BatchCreated> {
  requirePermission(actor, 'batches.create');
  return db.transaction(async (tx) => {
    const model = await findModelRow(tx, input.modelId);
    if (!model.active) {
      throw conflict('MODEL_RETIRED', `The model ${model.code} is retired; ask an administrator to reactivate it or pick another model.`);
    }
    if (!model.current) {
      const [current] = await tx
        .select()
        .from(driverModels)
        .where(and(eq(driverModels.code, model.code), eq(driverModels.current, true)));
      throw conflict(
        'MODEL_NOT_CURRENT',
        `${revisionLabel(model)} is not the current recipe of ${model.code}${current ? `; build with ${revisionLabel(current)}` : ''}.`,
        current ? { currentModelId: current.id, currentRevision: current.revision } : undefined,
      );
    }
    const [{ n: steps }] = await tx.select({ n: count() }).from(recipeSteps).where(eq(recipeSteps.modelId, model.id));
    if (steps === 0)
      throw conflict('MODEL_HAS_NO_STEPS', `The model ${model.code} has no recipe steps yet; an administrator must add them first.`);

    // <model code>-<yyMMdd of the plant day>-<seq of the day>; one writer per model and day at a time.
    const prefix = `${model.code}-${DateTime.fromJSDate(now).setZone(config.plantZone).toFormat('yyMMdd')}-`;
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`batch-code:${prefix}`}))`);
    const [{ n: today }] = await tx
      .select({ n: count() })
      .from(buildBatches)
      .where(like(buildBatches.code, `${prefix}%`)); // across every revision of the code
    const code = `${prefix}${String(today + 1).padStart(2, '0')}`;

    const [row] = await tx
      .insert(buildBatches)
      .values({ code, modelId: model.id, quantity: input.quantity, createdBy: actor.id, createdAt: now })
      .returning();
    const units = Array.from({ length: input.quantity }, (_, i) => ({ serial: serialFor(code, i + 1), batchId: row.id, createdAt: now }));
    const driverRows = [];
    for (let i = 0; i < units.length; i += 1000) {
      driverRows.push(
        ...(await tx
          .insert(drivers)
          .values(units.slice(i, i + 1000))
          .returning()),
      );
    }
    const batch = toBatch(row, model);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'batch.create',
      entityType: 'build_batch',
      entityId: row.id,
      after: { ...batch, firstSerial: units[0].serial, lastSerial: units[units.length - 1].serial },
    });
    return { batch, drivers: driverRows.map((d) => ({ id: d.id, serial: d.serial, status: d.status })) };
  });
}
