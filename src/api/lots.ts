import {
  certificateResultSchema,
  lotDetailSchema,
  lotHistorySchema,
  lotStatusChangesSchema,
  lotPageSchema,
  lotResultSchema,
  receiveLotResultSchema,
  type HistoryEntry,
  type StatusChangeEntry,
  type Lot,
  type LotDetail,
  type LotPage,
  type LotStatusChange,
  type ReceiveLotInput,
  type ReceiveLotResult,
} from '@shared/schemas/lots';
import type { LotStatus } from '@shared/constants';
import type { Attachment } from '@shared/schemas/attachments';
import { apiFetch } from './http';
import { uploadFile } from './attachments';

export type LotSort = 'receivedAt' | 'effectiveExpiry' | 'supplierLot' | 'status' | 'material';

export interface LotQuery {
  limit: number;
  offset: number;
  sort?: LotSort;
  dir?: 'asc' | 'desc';
  status?: readonly LotStatus[];
  materialId?: string | null;
  supplierId?: string | null;
  expiringWithinDays?: number | null;
  /** Supplier lot number or container code. */
  q?: string | null;
}

/** GET /api/lots (signed in): one page, sorted and filtered on the server. */
export function listLots(query: LotQuery, signal?: AbortSignal): Promise<LotPage> {
  return apiFetch('/api/lots', {
    query: {
      limit: query.limit,
      offset: query.offset,
      sort: query.sort,
      dir: query.dir,
      status: query.status && query.status.length > 0 ? query.status.join(',') : undefined,
      materialId: query.materialId,
      supplierId: query.supplierId,
      expiringWithinDays: query.expiringWithinDays,
      q: query.q,
    },
    schema: lotPageSchema,
    signal,
  });
}

/** GET /api/lots/:id (signed in). */
export function getLot(id: string): Promise<LotDetail> {
  return apiFetch(`/api/lots/${encodeURIComponent(id)}`, { schema: lotDetailSchema });
}

/** GET /api/lots/:id/history (`lots.readHistory`: quality, admin): audit entries of the lot and its containers. */
export async function lotHistory(id: string): Promise<HistoryEntry[]> {
  const result = await apiFetch(`/api/lots/${encodeURIComponent(id)}/history`, { schema: lotHistorySchema });
  return result.items;
}

/** GET /api/lots/:id/status-changes (signed in): the lot's status changes, when and why. */
export async function lotStatusChanges(id: string): Promise<StatusChangeEntry[]> {
  const result = await apiFetch(`/api/lots/${encodeURIComponent(id)}/status-changes`, { schema: lotStatusChangesSchema });
  return result.items;
}

/**
 * POST /api/lots (receiving) → 201 {lot, containers}. 409 DUPLICATE_LOT when the supplier lot
 * was received before (resend with confirmDuplicate: true after asking).
 */
export function receiveLot(input: ReceiveLotInput, idempotencyKey: string): Promise<ReceiveLotResult> {
  return apiFetch('/api/lots', { method: 'POST', body: input, schema: receiveLotResultSchema, idempotencyKey });
}

/** POST /api/lots/:id/status (quality): release, quarantine, reject; reason where required. */
export async function changeLotStatus(id: string, change: LotStatusChange): Promise<Lot> {
  const result = await apiFetch(`/api/lots/${encodeURIComponent(id)}/status`, { method: 'POST', body: change, schema: lotResultSchema });
  return result.lot;
}

/** POST /api/lots/:id/certificate (receiving, quality): the certificate of analysis. */
export function uploadCertificate(id: string, file: File, expiresOn?: string): Promise<{ attachment: Attachment; lot: Lot }> {
  return uploadFile(`/api/lots/${encodeURIComponent(id)}/certificate`, file, { expiresOn }, certificateResultSchema);
}

export type { LotStatus };
