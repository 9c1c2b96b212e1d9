import { stationListSchema, stationSchema, type Station, type StationInput, type StationPatch } from '@shared/schemas/stations';
import {
  loadResultSchema,
  stationLoadedSchema,
  unloadResultSchema,
  type LoadInput,
  type LoadResult,
  type StationLoaded,
  type UnloadInput,
  type UnloadResult,
} from '@shared/schemas/station-loads';
import { apiFetch } from './http';

/** GET /api/stations: active stations by code (and retired ones when asked). */
export async function listStations(options: { includeRetired?: boolean; kind?: string; area?: string } = {}): Promise<Station[]> {
  const result = await apiFetch('/api/stations', {
    schema: stationListSchema,
    query: { includeRetired: options.includeRetired ? 'true' : undefined, kind: options.kind, area: options.area },
  });
  return result.items;
}

/** GET /api/stations/:id */
export function getStation(id: string): Promise<Station> {
  return apiFetch(`/api/stations/${encodeURIComponent(id)}`, { schema: stationSchema });
}

/** POST /api/stations (admin); 409 DUPLICATE_CODE names the code field. */
export function createStation(input: StationInput): Promise<Station> {
  return apiFetch('/api/stations', { method: 'POST', body: input, schema: stationSchema });
}

/** PATCH /api/stations/:id (admin); `active: true` brings a retired station back. */
export function updateStation(id: string, patch: StationPatch): Promise<Station> {
  return apiFetch(`/api/stations/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch, schema: stationSchema });
}

/** POST /api/stations/:id/retire (admin): refuses loads from now on; what is loaded there is unloaded. */
export function retireStation(id: string): Promise<Station> {
  return apiFetch(`/api/stations/${encodeURIComponent(id)}/retire`, { method: 'POST', schema: stationSchema });
}

/** POST /api/stations/:id/load (assembler): 200 accepted, or an ApiError 409 with the refusal code and reason. */
export function loadAtStation(stationId: string, input: LoadInput, idempotencyKey?: string): Promise<LoadResult> {
  return apiFetch(`/api/stations/${encodeURIComponent(stationId)}/load`, {
    method: 'POST',
    body: input,
    schema: loadResultSchema,
    idempotencyKey,
  });
}

/** GET /api/stations/:id/loaded: what is loaded there now (optionally for one batch), with the server's clock. */
export function listLoaded(stationId: string, batchId?: string): Promise<StationLoaded> {
  return apiFetch(`/api/stations/${encodeURIComponent(stationId)}/loaded`, { schema: stationLoadedSchema, query: { batchId } });
}

/** POST /api/stations/:id/unload (assembler): one load by id or by scanned code. */
export function unloadAtStation(stationId: string, input: UnloadInput, idempotencyKey?: string): Promise<UnloadResult> {
  return apiFetch(`/api/stations/${encodeURIComponent(stationId)}/unload`, {
    method: 'POST',
    body: input,
    schema: unloadResultSchema,
    idempotencyKey,
  });
}
