import { healthSchema } from '@shared/schemas/health';
import { apiFetch } from './http';

/** GET /api/health once (no waiting while the database is down: the caller decides when to ask again). */
export function fetchHealth(signal?: AbortSignal) {
  return apiFetch('/api/health', { schema: healthSchema, signal, retryWhileDatabaseDown: false });
}
