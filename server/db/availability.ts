import { logger } from '../logger';

/**
 * Telling "the database cannot be reached" from every other failure, and keeping one line of
 * log per outage instead of one per request. A request that fails because PostgreSQL is down,
 * restarting or refusing connections is answered 503 DB_UNAVAILABLE with Retry-After (see
 * middleware/errors.ts); the pool makes new connections by itself when it is back.
 */

/** Seconds a client should wait before trying again while the database is unreachable. */
export const DB_RETRY_AFTER_SECONDS = 5;

/** Socket-level failures: nothing (or nothing alive) listens where the database should be. */
const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ECONNABORTED',
  'ETIMEDOUT',
  'EPIPE',
  'ENOTFOUND',
  'EAI_AGAIN',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENETDOWN',
]);

/**
 * PostgreSQL SQLSTATEs (PostgreSQL documentation, Appendix A "Error Codes") that mean the server
 * cannot serve us now: class 08 connection exception, 57P01 admin_shutdown, 57P02 crash_shutdown,
 * 57P03 cannot_connect_now (starting up or shutting down), 57P05 idle_session_timeout,
 * 53300 too_many_connections.
 */
function isUnavailableSqlState(code: string): boolean {
  return code.startsWith('08') || ['57P01', '57P02', '57P03', '57P05', '53300'].includes(code);
}

/** Messages node-postgres uses for a connection that died or never came up. */
const PG_MESSAGES = [
  'Connection terminated',
  'timeout exceeded when trying to connect',
  'Client has encountered a connection error and is not queryable',
  'Client was closed and is not queryable',
  'Cannot use a pool after calling end on the pool',
];

interface ErrorLike {
  code?: unknown;
  message?: unknown;
  cause?: unknown;
  errors?: unknown;
}

/** Whether `err` (or an error it wraps: Drizzle's cause, an AggregateError's list) means the database is unreachable. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (depth > 5 || typeof err !== 'object' || err === null) return false;
  const e = err as ErrorLike;
  if (typeof e.code === 'string') {
    if (NETWORK_CODES.has(e.code)) return true;
    if (/^[0-9A-Z]{5}$/.test(e.code) && isUnavailableSqlState(e.code)) return true;
  }
  if (typeof e.message === 'string' && PG_MESSAGES.some((m) => (e.message as string).startsWith(m))) return true;
  if (Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1))) return true;
  return isDatabaseUnavailable(e.cause, depth + 1);
}

/** The innermost message, for a log line (Drizzle's wrapper repeats the whole query). */
function rootMessage(err: unknown): string {
  let e = err as ErrorLike | undefined;
  for (let i = 0; i < 5 && e && typeof e === 'object' && e.cause; i++) e = e.cause as ErrorLike;
  if (e && typeof e === 'object' && Array.isArray(e.errors) && e.errors.length > 0) e = e.errors[0] as ErrorLike;
  const code = e && typeof e.code === 'string' ? ` (${e.code})` : '';
  return `${e && typeof e.message === 'string' ? e.message : String(e)}${code}`;
}

let downSince: number | null = null;

/** Records that the database failed us; logs once per outage. */
export function noteDatabaseDown(err: unknown): void {
  if (downSince !== null) return;
  downSince = Date.now();
  logger.error(`the database is unreachable: ${rootMessage(err)}; answering 503 until it is back`);
}

/** Records that a connection to the database was made; logs the end of an outage. */
export function noteDatabaseUp(): void {
  if (downSince === null) return;
  const seconds = ((Date.now() - downSince) / 1000).toFixed(1);
  downSince = null;
  logger.info(`the database is reachable again (after ${seconds} s)`);
}

export function databaseDownSince(): Date | null {
  return downSince === null ? null : new Date(downSince);
}
