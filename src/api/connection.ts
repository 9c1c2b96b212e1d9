import { reactive, readonly } from 'vue';

/**
 * Whether the server can reach its database, as the last API answers said: a 503 with code
 * DB_UNAVAILABLE marks it unreachable (the server says when to try again, Retry-After); any
 * successful answer marks it back. The banner (components/layout/DatabaseBanner.vue) shows it,
 * and useDatabaseStatus asks /api/health now and then while it is down.
 */
const state = reactive({
  databaseDown: false,
  /** When the first refusal of this outage came (ms since epoch), or null. */
  downSince: null as number | null,
  /** The server's Retry-After, in milliseconds. */
  retryAfterMs: 5000,
});

export const connection = readonly(state);

/** The delay a 503's Retry-After asks for (RFC 9110 §10.2.3: seconds, or an HTTP date), kept within 1–30 s. */
export function retryDelayMs(retryAfter: string | null, now = Date.now()): number {
  let ms = 5000;
  if (retryAfter !== null && /^\d+$/.test(retryAfter.trim())) ms = Number(retryAfter.trim()) * 1000;
  else if (retryAfter !== null && !Number.isNaN(Date.parse(retryAfter))) ms = Date.parse(retryAfter) - now;
  return Math.min(30_000, Math.max(1000, ms));
}

export function reportDatabaseDown(retryAfterMs: number): void {
  state.retryAfterMs = retryAfterMs;
  if (state.databaseDown) return;
  state.databaseDown = true;
  state.downSince = Date.now();
}

export function reportDatabaseUp(): void {
  if (!state.databaseDown) return;
  state.databaseDown = false;
  state.downSince = null;
}
