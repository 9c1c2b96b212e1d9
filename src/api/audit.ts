import { auditPageSchema, auditVerifyResultSchema, type AuditPage, type AuditVerifyResult } from '@shared/schemas/audit';
import { apiFetch } from './http';

/** The audit page's filters as the page holds them; empty ones are left out of the request. */
export interface AuditFilters {
  entity?: string | null;
  entityId?: string | null;
  actor?: string | null;
  action?: string | null;
  /** Plant dates (YYYY-MM-DD), both ends included. */
  from?: string | null;
  to?: string | null;
}

/** GET /api/audit: newest first, one page; pass the previous page's nextCursor to continue. */
export function listAudit(filters: AuditFilters, cursor?: number | null, limit = 50, signal?: AbortSignal): Promise<AuditPage> {
  return apiFetch('/api/audit', {
    query: { ...filters, cursor: cursor ?? undefined, limit },
    schema: auditPageSchema,
    signal,
  });
}

/** POST /api/audit/verify: walks the whole chain and names the first broken link, if any. */
export function verifyAudit(): Promise<AuditVerifyResult> {
  return apiFetch('/api/audit/verify', { method: 'POST', schema: auditVerifyResultSchema });
}
