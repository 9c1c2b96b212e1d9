import { plantConfigSchema, type PlantConfig } from '@shared/schemas/plant';
import { apiFetch } from './http';

/** GET /api/config (public): the plant's time zone and name. */
export function getPlantConfig(): Promise<PlantConfig> {
  return apiFetch('/api/config', { schema: plantConfigSchema });
}
