import { cureEstimateSchema, cureListSchema, type CureEstimate, type CureEstimateInput, type CureList } from '@shared/schemas/cure';
import { apiFetch } from './http';

/** GET /api/cure/board: every cure being timed, recomputed from the readings. */
export function getCureBoard(filter: { area?: string } = {}): Promise<CureList> {
  return apiFetch('/api/cure/board', { schema: cureListSchema, query: { ...filter } });
}

/** POST /api/cure/estimate: handling and full-cure times at one temperature or over readings. */
export function estimateCure(input: CureEstimateInput): Promise<CureEstimate> {
  return apiFetch('/api/cure/estimate', { method: 'POST', body: input, schema: cureEstimateSchema });
}
