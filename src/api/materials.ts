import {
  materialListSchema,
  materialResultSchema,
  sdsUploadResultSchema,
  type Material,
  type MaterialInput,
  type MaterialPatch,
} from '@shared/schemas/materials';
import type { MaterialKind } from '@shared/constants';
import { fefoResultSchema, type FefoResult } from '@shared/schemas/containers';
import { apiFetch } from './http';
import { uploadFile } from './attachments';

export interface MaterialFilter {
  kind?: MaterialKind;
  /** true: in use; false: retired; absent: both. */
  active?: boolean;
}

/** GET /api/materials (signed in). */
export async function listMaterials(filter: MaterialFilter = {}): Promise<Material[]> {
  const result = await apiFetch('/api/materials', {
    query: { kind: filter.kind, active: filter.active === undefined ? undefined : String(filter.active) },
    schema: materialListSchema,
  });
  return result.items;
}

/** GET /api/materials/:id (signed in). */
export function getMaterial(id: string): Promise<Material> {
  return apiFetch(`/api/materials/${encodeURIComponent(id)}`, { schema: materialResultSchema });
}

/** POST /api/materials (admin) → 201. */
export function createMaterial(input: MaterialInput, idempotencyKey?: string): Promise<Material> {
  return apiFetch('/api/materials', { method: 'POST', body: input, schema: materialResultSchema, idempotencyKey });
}

/** PATCH /api/materials/:id (admin): only the fields given change; `active: true` reinstates. */
export function updateMaterial(id: string, patch: MaterialPatch): Promise<Material> {
  return apiFetch(`/api/materials/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch, schema: materialResultSchema });
}

/** POST /api/materials/:id/retire (admin): no longer offered for receiving; history stays. */
export function retireMaterial(id: string): Promise<Material> {
  return apiFetch(`/api/materials/${encodeURIComponent(id)}/retire`, { method: 'POST', schema: materialResultSchema });
}

/** POST /api/materials/:id/sds (admin) → 201: uploads the safety data sheet (PDF, PNG or JPEG). */
export async function uploadSds(id: string, file: File): Promise<Material> {
  const result = await uploadFile(`/api/materials/${encodeURIComponent(id)}/sds`, file, {}, sdsUploadResultSchema);
  return result.material;
}

/** GET /api/materials/:id/fefo (signed in): usable containers first-expiry-first-out. */
export function materialFefo(id: string): Promise<FefoResult> {
  return apiFetch(`/api/materials/${encodeURIComponent(id)}/fefo`, { schema: fefoResultSchema });
}
