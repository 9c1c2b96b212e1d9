/**
 * When each session was last used, for the "your sessions" list. Kept in `session_activity`,
 * apart from the `sessions` row every request reads, and written off the request's path: at most
 * once a minute per session in each process (an upsert that never moves the time backwards).
 */
import { sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { sessionActivity } from '../../db/schema';
import { logger } from '../../logger';

/** Resolution of "last seen": a session is written again only after this long. */
export const SEEN_RESOLUTION_MS = 60_000;
/** Forget sessions not seen by this process for this long (keeps the map small). */
const FORGET_AFTER_MS = 3600_000;

const lastWritten = new Map<string, number>();

function forgetOld(now: number): void {
  if (lastWritten.size < 5000) return;
  for (const [id, at] of lastWritten) if (now - at > FORGET_AFTER_MS) lastWritten.delete(id);
}

/** Notes that a request came with this session (does not wait for the write). */
export function noteSessionSeen(sessionId: string, now = Date.now()): void {
  const previous = lastWritten.get(sessionId);
  if (previous !== undefined && now - previous < SEEN_RESOLUTION_MS) return;
  lastWritten.set(sessionId, now);
  forgetOld(now);
  const at = new Date(now);
  db.insert(sessionActivity)
    .values({ sessionId, lastSeenAt: at })
    .onConflictDoUpdate({
      target: sessionActivity.sessionId,
      set: { lastSeenAt: sql`greatest(${sessionActivity.lastSeenAt}, excluded.last_seen_at)` },
    })
    .then(
      () => undefined,
      (err: unknown) => {
        // A session deleted in between (pruned) fails the foreign key: nothing to record then.
        lastWritten.delete(sessionId);
        logger.debug({ err }, 'recording when a session was last seen failed');
      },
    );
}
