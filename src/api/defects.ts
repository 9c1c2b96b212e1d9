import {
  defectCodeListSchema,
  defectCodeSchema,
  type DefectCode,
  type DefectCodeCreate,
  type DefectCodeUpdate,
} from '@shared/schemas/defects';
import { apiFetch } from './http';

/** GET /api/defect-codes (`active: true` = only those a tester may pick). */
export async function listDefectCodes(options: { active?: boolean } = {}): Promise<DefectCode[]> {
  const result = await apiFetch('/api/defect-codes', {
    schema: defectCodeListSchema,
    query: { active: options.active === undefined ? undefined : String(options.active) },
  });
  return result.items;
}

/** POST /api/defect-codes (quality, admin). */
export function createDefectCode(input: DefectCodeCreate): Promise<DefectCode> {
  return apiFetch('/api/defect-codes', { method: 'POST', body: input, schema: defectCodeSchema });
}

/** PATCH /api/defect-codes/:code (quality, admin): description, or active (codes are never deleted). */
export function updateDefectCode(code: string, patch: DefectCodeUpdate): Promise<DefectCode> {
  return apiFetch(`/api/defect-codes/${encodeURIComponent(code)}`, { method: 'PATCH', body: patch, schema: defectCodeSchema });
}
