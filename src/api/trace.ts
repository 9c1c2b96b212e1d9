import { driverTraceSchema, lotTraceSchema, type DriverTrace, type LotTrace } from '@shared/schemas/trace';
import { apiFetch } from './http';

/** GET /api/drivers/:serial/trace: backward genealogy (batch → step runs → containers/mixes → lots). */
export function traceDriver(serial: string): Promise<DriverTrace> {
  return apiFetch(`/api/drivers/${encodeURIComponent(serial)}/trace`, { schema: driverTraceSchema });
}

/** GET /api/lots/:id/trace: forward genealogy (every batch and driver built with the lot). */
export function traceLot(lotId: string): Promise<LotTrace> {
  return apiFetch(`/api/lots/${encodeURIComponent(lotId)}/trace`, { schema: lotTraceSchema });
}

/** The containment list's address (GET /api/lots/:id/trace.csv), for a download link: the cookie goes along. */
export function containmentCsvUrl(lotId: string): string {
  return `/api/lots/${encodeURIComponent(lotId)}/trace.csv`;
}
