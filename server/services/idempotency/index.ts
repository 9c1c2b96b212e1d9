import { and, eq, isNull, lt, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { idempotencyKeys } from '../../db/schema';

/** A first request still unanswered after this long is taken to have died. */
const STALE_MS = 5 * 60 * 1000;

export type StoredRequest = typeof idempotencyKeys.$inferSelect;

const byKey = (actorId: string, key: string) => and(eq(idempotencyKeys.actorId, actorId), eq(idempotencyKeys.key, key));

/** The claim itself, a named prepared statement: most requests need nothing else. */
const insertKey = db
  .insert(idempotencyKeys)
  .values({
    key: sql.placeholder('key'),
    actorId: sql.placeholder('actorId'),
    method: sql.placeholder('method'),
    path: sql.placeholder('path'),
    requestHash: sql.placeholder('requestHash'),
  })
  .onConflictDoNothing()
  .returning({ key: idempotencyKeys.key })
  .prepare('idempotency_claim');

const storeKey = db
  .update(idempotencyKeys)
  .set({ statusCode: sql`${sql.placeholder('statusCode')}::int`, responseBody: sql`${sql.placeholder('body')}::jsonb` })
  .where(and(eq(idempotencyKeys.actorId, sql.placeholder('actorId')), eq(idempotencyKeys.key, sql.placeholder('key'))))
  .prepare('idempotency_store');

/**
 * Claims a key for a first request: true when this request may run. When false, `first` is the
 * earlier request with the key (null if it was released in between). One statement for a new
 * key; a key whose first request died without an answer (unanswered for STALE_MS) is taken over.
 */
export async function claimKey(
  actorId: string,
  key: string,
  method: string,
  path: string,
  requestHash: string | null,
): Promise<{ claimed: true } | { claimed: false; first: StoredRequest | null }> {
  if ((await insertKey.execute({ key, actorId, method, path, requestHash })).length === 1) return { claimed: true };
  const takenOver = await db
    .delete(idempotencyKeys)
    .where(and(byKey(actorId, key), isNull(idempotencyKeys.statusCode), lt(idempotencyKeys.createdAt, new Date(Date.now() - STALE_MS))))
    .returning({ key: idempotencyKeys.key });
  if (takenOver.length === 1 && (await insertKey.execute({ key, actorId, method, path, requestHash })).length === 1)
    return { claimed: true };
  const [first] = await db.select().from(idempotencyKeys).where(byKey(actorId, key));
  return { claimed: false, first: first ?? null };
}

/** Keeps the first response for repeats. */
export async function storeResponse(actorId: string, key: string, statusCode: number, body: unknown): Promise<void> {
  await storeKey.execute({ actorId, key, statusCode, body: body === undefined || body === null ? null : JSON.stringify(body) });
}

/** Forgets a key (its first request failed on the server), so a retry can run. */
export async function releaseKey(actorId: string, key: string): Promise<void> {
  await db.delete(idempotencyKeys).where(byKey(actorId, key));
}

/** Drops keys created before `before`. */
export async function pruneKeys(before: Date): Promise<void> {
  await db.delete(idempotencyKeys).where(lt(idempotencyKeys.createdAt, before));
}
