import { supplierListSchema, supplierSchema, type Supplier, type SupplierInput, type SupplierPatch } from '@shared/schemas/suppliers';
import { apiFetch } from './http';

/** GET /api/suppliers (signed in); `active` filters in-use (true) or retired (false) ones. */
export async function listSuppliers(filter: { active?: boolean } = {}): Promise<Supplier[]> {
  const result = await apiFetch('/api/suppliers', {
    query: { active: filter.active === undefined ? undefined : String(filter.active) },
    schema: supplierListSchema,
  });
  return result.items;
}

/** POST /api/suppliers (admin, purchasing) → 201. */
export function createSupplier(input: SupplierInput, idempotencyKey?: string): Promise<Supplier> {
  return apiFetch('/api/suppliers', { method: 'POST', body: input, schema: supplierSchema, idempotencyKey });
}

/** PATCH /api/suppliers/:id (admin, purchasing); `active: false` retires, `true` reinstates. */
export function updateSupplier(id: string, patch: SupplierPatch): Promise<Supplier> {
  return apiFetch(`/api/suppliers/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch, schema: supplierSchema });
}

/** POST /api/suppliers/:id/retire (admin, purchasing). */
export function retireSupplier(id: string): Promise<Supplier> {
  return apiFetch(`/api/suppliers/${encodeURIComponent(id)}/retire`, { method: 'POST', schema: supplierSchema });
}
