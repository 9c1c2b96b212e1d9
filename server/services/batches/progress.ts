import { and, asc, eq, isNull } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { stepRuns } from '../../db/schema';
import { conflict } from '../../errors';
import type { RecipeStep } from '../../../shared/schemas/models';
import { loadSteps } from '../models';
import { batchStatusWords } from '../../../shared/words';

type StepRunRow = typeof stepRuns.$inferSelect;

export interface BatchProgress {
  steps: RecipeStep[];
  /** The whole-batch run of each step (at most one per step), by step id. */
  buildRuns: Map<string, StepRunRow>;
  /** Steps without a finished whole-batch run, in seq order. */
  pending: RecipeStep[];
}

/** Where a batch is on its recipe: which steps have run. */
export async function batchProgress(tx: DbOrTx, batch: { id: string; modelId: string }): Promise<BatchProgress> {
  const steps = (await loadSteps(tx, [batch.modelId])).get(batch.modelId) ?? [];
  const runs = await tx
    .select()
    .from(stepRuns)
    .where(and(eq(stepRuns.batchId, batch.id), isNull(stepRuns.driverId)))
    .orderBy(asc(stepRuns.startedAt));
  const buildRuns = new Map(runs.map((r) => [r.stepId, r]));
  const pending = steps.filter((s) => !buildRuns.get(s.id)?.finishedAt);
  return { steps, buildRuns, pending };
}

export function checkBatchOpen(batch: { code: string; status: string }, allowCompleted = false): void {
  if (batch.status === 'cancelled' || (batch.status === 'completed' && !allowCompleted)) {
    throw conflict(
      'BATCH_CLOSED',
      `Batch ${batch.code} is ${batchStatusWords(batch.status).toLowerCase()}; nothing more can be loaded or run for it. Scan the batch you are building.`,
    );
  }
}
