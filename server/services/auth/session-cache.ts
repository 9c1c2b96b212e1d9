/**
 * Signed-in sessions remembered in this process, so a request does not ask the database who its
 * token belongs to every time (that question was one of the two statements of a scan lookup).
 *
 * Correctness rests on PostgreSQL's LISTEN/NOTIFY: triggers on `sessions` and `users`
 * (drizzle/0012_auth_notify.sql) send `s:<session id>` when a session is revoked, shortened or
 * deleted and `u:<user id>` when a user's roles, active flag, name, e-mail or password change,
 * at the commit of the change, to every process. Each process listens on its own connection and
 * forgets what a message names. While that connection is not listening nothing is remembered and
 * every request asks the database, as before. Changes made in this process are forgotten at once
 * as well (`forgetSession`, `forgetUser`), so the next request of the same caller never races the
 * message. An entry lives at most `TTL_MS` and never past its session's expiry.
 */
import pg from 'pg';
import type { Actor } from './actor';
import { logger } from '../../logger';

export const AUTH_CHANNEL = 'tacklog_auth';
const TTL_MS = 60_000;
const MAX_ENTRIES = 20_000;
const RECONNECT_MS = 2_000;

interface Entry {
  actor: Actor;
  userId: string;
  /** Epoch ms: the session's own expiry or the cache's time limit, whichever comes first. */
  until: number;
}

const entries = new Map<string, Entry>();
/** Bumped on every forgetting: an answer read before a change must not be remembered after it. */
let generation = 0;
let listener: pg.Client | null = null;
let listening = false;
let stopped = true;
let retry: NodeJS.Timeout | null = null;

export function sessionCacheActive(): boolean {
  return listening;
}

/** The remembered actor for this session, if it is still valid here. */
export function cachedActor(sessionId: string, userId: string): Actor | undefined {
  if (!listening) return undefined;
  const entry = entries.get(sessionId);
  if (!entry) return undefined;
  if (entry.userId !== userId || entry.until <= Date.now()) {
    entries.delete(sessionId);
    return undefined;
  }
  return entry.actor;
}

/** A token that says whether anything was forgotten since it was taken (see `remember`). */
export function cacheGeneration(): number {
  return generation;
}

/**
 * Remembers an actor read from the database, unless something was forgotten since `readAt`
 * (the read may predate the change) or the cache is not listening.
 */
export function remember(sessionId: string, actor: Actor, sessionExpiresAt: Date, readAt: number): void {
  if (!listening || readAt !== generation) return;
  if (entries.size >= MAX_ENTRIES) entries.delete(entries.keys().next().value as string);
  entries.set(sessionId, { actor, userId: actor.id, until: Math.min(sessionExpiresAt.getTime(), Date.now() + TTL_MS) });
}

export function forgetSession(sessionId: string): void {
  generation += 1;
  entries.delete(sessionId);
}

export function forgetUser(userId: string): void {
  generation += 1;
  for (const [id, entry] of entries) if (entry.userId === userId) entries.delete(id);
}

export function forgetAll(): void {
  generation += 1;
  entries.clear();
}

function onMessage(payload: string | undefined): void {
  if (!payload) return forgetAll();
  const kind = payload.slice(0, 2);
  const id = payload.slice(2);
  if (kind === 's:') forgetSession(id);
  else if (kind === 'u:') forgetUser(id);
  else forgetAll();
}

function lost(err?: Error): void {
  if (err) logger.warn({ err }, 'session cache: the listening connection failed; asking the database on every request until it is back');
  listening = false;
  forgetAll();
  const client = listener;
  listener = null;
  client?.end().catch(() => undefined);
  if (!stopped && !retry) {
    retry = setTimeout(() => {
      retry = null;
      void connect();
    }, RECONNECT_MS);
    retry.unref();
  }
}

async function connect(): Promise<void> {
  if (stopped) return;
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL, connectionTimeoutMillis: 5000 });
  listener = client;
  client.on('notification', (msg) => {
    if (msg.channel === AUTH_CHANNEL) onMessage(msg.payload);
  });
  client.on('error', (err) => lost(err));
  client.on('end', () => {
    if (listener === client) lost();
  });
  try {
    await client.connect();
    await client.query(`LISTEN ${AUTH_CHANNEL}`);
    if (stopped || listener !== client) {
      await client.end();
      return;
    }
    forgetAll();
    listening = true;
  } catch (err) {
    if (listener === client) lost(err as Error);
  }
}

/**
 * Starts remembering sessions (the server does this at start; TACKLOG_SESSION_CACHE=off keeps
 * every request asking the database). Resolves once listening, or after the first failed try
 * (it keeps trying in the background).
 */
export async function startSessionCache(): Promise<void> {
  if (/^(off|false|no|0)$/i.test(process.env.TACKLOG_SESSION_CACHE ?? '')) return;
  if (!stopped) return;
  stopped = false;
  await connect();
}

export async function stopSessionCache(): Promise<void> {
  stopped = true;
  listening = false;
  if (retry) clearTimeout(retry);
  retry = null;
  forgetAll();
  const client = listener;
  listener = null;
  await client?.end().catch(() => undefined);
}
