import { z } from 'zod';
import { alertListSchema, alertSchema, complianceRunResultSchema, type Alert, type ComplianceRunResult } from '@shared/schemas/alerts';
import type { AlertSeverity } from '@shared/constants';
import { apiFetch } from './http';

export type AlertStateFilter = 'live' | 'open' | 'acknowledged' | 'resolved';

export interface AlertQuery {
  limit: number;
  offset: number;
  /** 'live' = open and acknowledged; absent = every state. */
  state?: AlertStateFilter;
  kind?: string | null;
  severity?: AlertSeverity | null;
}

const alertResultSchema = z.object({ alert: alertSchema });

/** GET /api/alerts (signed in): the alerts for the user's roles (all for an administrator), newest first. */
export function listAlerts(query: AlertQuery, signal?: AbortSignal): Promise<z.infer<typeof alertListSchema>> {
  return apiFetch('/api/alerts', {
    query: { limit: query.limit, offset: query.offset, state: query.state, kind: query.kind, severity: query.severity },
    schema: alertListSchema,
    signal,
  });
}

/** POST /api/alerts/:id/acknowledge (signed in, the alert's audience). */
export async function acknowledgeAlert(id: string): Promise<Alert> {
  const result = await apiFetch(`/api/alerts/${encodeURIComponent(id)}/acknowledge`, { method: 'POST', schema: alertResultSchema });
  return result.alert;
}

/** POST /api/alerts/:id/resolve (admin, quality, purchasing): `resolution` says what was done. */
export async function resolveAlert(id: string, input: { resolution: string }): Promise<Alert> {
  const result = await apiFetch(`/api/alerts/${encodeURIComponent(id)}/resolve`, {
    method: 'POST',
    body: input,
    schema: alertResultSchema,
  });
  return result.alert;
}

/** POST /api/compliance/run (admin, quality): one sweep of the compliance watch now. */
export function runComplianceWatch(): Promise<ComplianceRunResult> {
  return apiFetch('/api/compliance/run', { method: 'POST', schema: complianceRunResultSchema });
}
