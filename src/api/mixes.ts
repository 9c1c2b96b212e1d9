import { mixResultSchema, type MixInput, type MixResult } from '@shared/schemas/mixes';
import { apiFetch } from './http';

/** POST /api/stations/:id/mixes (assembler): a two-part mix from a resin and a hardener container; pot life starts now. */
export function createMix(stationId: string, input: MixInput, idempotencyKey?: string): Promise<MixResult> {
  return apiFetch(`/api/stations/${encodeURIComponent(stationId)}/mixes`, {
    method: 'POST',
    body: input,
    schema: mixResultSchema,
    idempotencyKey,
  });
}

/** GET /api/mixes/:id */
export function getMix(id: string): Promise<MixResult> {
  return apiFetch(`/api/mixes/${encodeURIComponent(id)}`, { schema: mixResultSchema });
}
