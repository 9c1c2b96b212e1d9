import { deviationListSchema, deviationResultSchema, type Deviation, type DeviationInput } from '@shared/schemas/deviations';
import { apiFetch } from './http';

/** POST /api/deviations (quality): a signed decision to go on despite a rule (e.g. early start before full cure). */
export async function recordDeviation(input: DeviationInput, idempotencyKey?: string): Promise<Deviation> {
  const result = await apiFetch('/api/deviations', { method: 'POST', body: input, schema: deviationResultSchema, idempotencyKey });
  return result.deviation;
}

/** GET /api/deviations?batchId=&stepId= */
export async function listDeviations(filter: { batchId?: string; stepId?: string } = {}): Promise<Deviation[]> {
  const result = await apiFetch('/api/deviations', { schema: deviationListSchema, query: { ...filter } });
  return result.items;
}
