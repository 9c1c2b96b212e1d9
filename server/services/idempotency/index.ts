import { and, eq, isNull, lt } from 'drizzle-orm';
import { db } from '../../db/client';
import { idempotencyKeys } from '../../db/schema';

/** A first request still unanswered after this long is taken to have died. */
const STALE_MS = 5 * 60 * 1000;

export type StoredRequest = typeof idempotencyKeys.$inferSelect;

const byKey = (actorId: string, key: string) => and(eq(idempotencyKeys.actorId, actorId), eq(idempotencyKeys.key, key));

/**
 * Claims a key for a first request: true when this request may run. When false, `first` is the
 * earlier request with the key (null if it was released in between).
 */
export async function claimKey(
  actorId: string,
  key: string,
  method: string,
  path: string,
  requestHash: string | null,
): Promise<{ claimed: true } | { claimed: false; first: StoredRequest | null }> {
  // Take over a key whose first request died without an answer.
  await db
    .delete(idempotencyKeys)
    .where(and(byKey(actorId, key), isNull(idempotencyKeys.statusCode), lt(idempotencyKeys.createdAt, new Date(Date.now() - STALE_MS))));
  const inserted = await db
    .insert(idempotencyKeys)
    .values({ key, actorId, method, path, requestHash })
    .onConflictDoNothing()
    .returning({ key: idempotencyKeys.key });
  if (inserted.length === 1) return { claimed: true };
  const [first] = await db.select().from(idempotencyKeys).where(byKey(actorId, key));
  return { claimed: false, first: first ?? null };
}

/** Keeps the first response for repeats. */
export async function storeResponse(actorId: string, key: string, statusCode: number, body: unknown): Promise<void> {
  await db.update(idempotencyKeys).set({ statusCode, responseBody: body ?? null }).where(byKey(actorId, key));
}

/** Forgets a key (its first request failed on the server), so a retry can run. */
export async function releaseKey(actorId: string, key: string): Promise<void> {
  await db.delete(idempotencyKeys).where(byKey(actorId, key));
}

/** Drops keys created before `before`. */
export async function pruneKeys(before: Date): Promise<void> {
  await db.delete(idempotencyKeys).where(lt(idempotencyKeys.createdAt, before));
}
