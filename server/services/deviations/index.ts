import { and, asc, eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { deviations, users } from '../../db/schema';
import { AppError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { findBatch } from '../batches/read';
import { loadSteps } from '../models';
import type { Deviation, DeviationInput } from '../../../shared/schemas/deviations';

type Row = typeof deviations.$inferSelect;

function toDeviation(r: Row, signedByName: string): Deviation {
  return {
    id: r.id,
    kind: r.kind,
    batchId: r.batchId,
    stepId: r.stepId,
    reason: r.reason,
    meaning: r.meaning,
    signedBy: r.signedBy,
    signedByName,
    signedAt: r.signedAt.toISOString(),
    usedAt: r.usedAt?.toISOString() ?? null,
  };
}

/**
 * POST /api/deviations (quality): a signed decision (21 CFR 11.50: name, time, meaning) to let a
 * step of a batch start before the previous step's cure is complete. Used by the next start.
 */
export async function recordDeviation(actor: Actor, input: DeviationInput, now: Date = new Date()): Promise<{ deviation: Deviation }> {
  requirePermission(actor, 'deviations.record');
  return db.transaction(async (tx) => {
    const { row: batch } = await findBatch(tx, input.batchId);
    const steps = (await loadSteps(tx, [batch.modelId])).get(batch.modelId) ?? [];
    const step = steps.find((s) => s.id === input.stepId);
    if (!step)
      throw new AppError('NOT_FOUND', `That step is not in the recipe of batch ${batch.code}.`, 404, [
        { field: 'stepId', message: 'is not a step of this batch' },
      ]);
    const [row] = await tx
      .insert(deviations)
      .values({
        kind: input.kind,
        batchId: batch.id,
        stepId: step.id,
        reason: input.reason,
        meaning: 'approval: start before the previous step is fully cured',
        signedBy: actor.id,
        signedAt: now,
      })
      .returning();
    const deviation = toDeviation(row, actor.name);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'deviation.sign',
      entityType: 'deviation',
      entityId: row.id,
      after: deviation,
      reason: input.reason,
    });
    return { deviation };
  });
}

export async function listDeviations(query: { batchId?: string; stepId?: string }): Promise<{ items: Deviation[] }> {
  const rows = await db
    .select({ d: deviations, name: users.name })
    .from(deviations)
    .innerJoin(users, eq(users.id, deviations.signedBy))
    .where(
      and(
        query.batchId ? eq(deviations.batchId, query.batchId) : undefined,
        query.stepId ? eq(deviations.stepId, query.stepId) : undefined,
      ),
    )
    .orderBy(asc(deviations.signedAt))
    .limit(500);
  return { items: rows.map((r) => toDeviation(r.d, r.name)) };
}
