import {
  driverModelListSchema,
  driverModelSchema,
  type DriverModel,
  type DriverModelInput,
  type DriverModelPatch,
} from '@shared/schemas/models';
import { apiFetch } from './http';

/** GET /api/models: driver models with their recipes (retired ones when asked). */
export async function listModels(options: { includeRetired?: boolean } = {}): Promise<DriverModel[]> {
  const result = await apiFetch('/api/models', {
    schema: driverModelListSchema,
    query: { includeRetired: options.includeRetired ? 'true' : undefined },
  });
  return result.items;
}

/** GET /api/models/:id */
export function getModel(id: string): Promise<DriverModel> {
  return apiFetch(`/api/models/${encodeURIComponent(id)}`, { schema: driverModelSchema });
}

/** POST /api/models (admin): a model and its ordered recipe steps. */
export function createModel(input: DriverModelInput): Promise<DriverModel> {
  return apiFetch('/api/models', { method: 'POST', body: input, schema: driverModelSchema });
}

/** PATCH /api/models/:id (admin): `steps` replaces the recipe, only while no batch has used the model. */
export function updateModel(id: string, patch: DriverModelPatch): Promise<DriverModel> {
  return apiFetch(`/api/models/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch, schema: driverModelSchema });
}
