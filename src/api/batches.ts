import {
  batchCreatedSchema,
  batchDetailSchema,
  batchPageSchema,
  type BatchCreated,
  type BatchDetail,
  type BatchInput,
  type BatchPage,
} from '@shared/schemas/batches';
import type { BatchStatus } from '@shared/constants';
import { cureListSchema, type CureList } from '@shared/schemas/cure';
import { apiFetch } from './http';

export type { BatchStatus };

export interface BatchListOptions {
  limit?: number;
  offset?: number;
  status?: BatchStatus;
  modelId?: string;
  /** Part of the batch code. */
  q?: string;
}

/** GET /api/batches: newest first, paged. */
export function listBatches(options: BatchListOptions = {}): Promise<BatchPage> {
  return apiFetch('/api/batches', { schema: batchPageSchema, query: { ...options } });
}

/** GET /api/batches/:id: the traveler (steps with their state, materials, drivers). */
export function getBatch(id: string): Promise<BatchDetail> {
  return apiFetch(`/api/batches/${encodeURIComponent(id)}`, { schema: batchDetailSchema });
}

/** POST /api/batches (assembler, quality) → the batch and its drivers' serials. */
export function createBatch(input: BatchInput, idempotencyKey?: string): Promise<BatchCreated> {
  return apiFetch('/api/batches', { method: 'POST', body: input, schema: batchCreatedSchema, idempotencyKey });
}

/** GET /api/batches/:id/cure: the batch's cures being timed. */
export function getBatchCure(id: string): Promise<CureList> {
  return apiFetch(`/api/batches/${encodeURIComponent(id)}/cure`, { schema: cureListSchema });
}
