import {
  driverModelListSchema,
  driverModelSchema,
  type DriverModel,
  type DriverModelInput,
  type DriverModelPatch,
} from '@shared/schemas/models';
import { apiFetch } from './http';

/** GET /api/models: driver models with their recipes (retired ones, every revision, one code when asked). */
export async function listModels(
  options: { includeRetired?: boolean; includeRevisions?: boolean; code?: string } = {},
): Promise<DriverModel[]> {
  const result = await apiFetch('/api/models', {
    schema: driverModelListSchema,
    query: {
      includeRetired: options.includeRetired ? 'true' : undefined,
      includeRevisions: options.includeRevisions ? 'true' : undefined,
      code: options.code,
    },
  });
  return result.items;
}

/** POST /api/models/:id/revisions (recipes): a copy of this revision as the next one, editable. */
export function copyAsRevision(id: string): Promise<DriverModel> {
  return apiFetch(`/api/models/${encodeURIComponent(id)}/revisions`, { method: 'POST', body: {}, schema: driverModelSchema });
}

/** POST /api/models/:id/make-current (recipes): new batches of the code are built with this revision. */
export function makeRevisionCurrent(id: string): Promise<DriverModel> {
  return apiFetch(`/api/models/${encodeURIComponent(id)}/make-current`, { method: 'POST', body: {}, schema: driverModelSchema });
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
