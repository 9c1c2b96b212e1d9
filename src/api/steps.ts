import { stepRunResultSchema, type StepActionInput, type StepRunResult } from '@shared/schemas/steps';
import { apiFetch } from './http';

function stepPath(batchId: string, stepId: string, action: 'start' | 'finish'): string {
  return `/api/batches/${encodeURIComponent(batchId)}/steps/${encodeURIComponent(stepId)}/${action}`;
}

/**
 * POST /api/batches/:id/steps/:stepId/start (assembler). 409 CURE_INCOMPLETE while the previous
 * step's cure is not complete (details: cureIncompleteDetailsSchema); a quality deviation allows it.
 */
export function startStep(batchId: string, stepId: string, input: StepActionInput, idempotencyKey?: string): Promise<StepRunResult> {
  return apiFetch(stepPath(batchId, stepId, 'start'), { method: 'POST', body: input, schema: stepRunResultSchema, idempotencyKey });
}

/** POST /api/batches/:id/steps/:stepId/finish (assembler): the run gets its cure times. */
export function finishStep(batchId: string, stepId: string, input: StepActionInput, idempotencyKey?: string): Promise<StepRunResult> {
  return apiFetch(stepPath(batchId, stepId, 'finish'), { method: 'POST', body: input, schema: stepRunResultSchema, idempotencyKey });
}
