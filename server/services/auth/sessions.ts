/** The signed-in user's own sessions: list them, end one (GET and DELETE /api/auth/sessions). */
import { forgetSession } from './session-cache';
import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { sessionActivity, sessions } from '../../db/schema';
import { notFound } from '../../errors';
import type { OwnSession } from '../../../shared/schemas/auth';
import { recordAudit } from '../audit';
import type { Actor } from './actor';

/** This user's sessions that still work (neither ended nor expired), newest first. */
export async function listOwnSessions(actor: Actor): Promise<{ items: OwnSession[] }> {
  const rows = await db
    .select({
      id: sessions.id,
      createdAt: sessions.createdAt,
      expiresAt: sessions.expiresAt,
      userAgent: sessions.userAgent,
      ip: sessions.ip,
      lastSeenAt: sessionActivity.lastSeenAt,
    })
    .from(sessions)
    .leftJoin(sessionActivity, eq(sessionActivity.sessionId, sessions.id))
    .where(and(eq(sessions.userId, actor.id), isNull(sessions.revokedAt), gt(sessions.expiresAt, sql`now()`)))
    .orderBy(desc(sessions.createdAt));
  return {
    items: rows.map((r) => ({
      id: r.id,
      startedAt: r.createdAt.toISOString(),
      lastSeenAt: r.lastSeenAt?.toISOString() ?? null,
      expiresAt: r.expiresAt.toISOString(),
      userAgent: r.userAgent,
      ip: r.ip,
      current: r.id === actor.sessionId,
    })),
  };
}

/**
 * Ends one of this user's own sessions at once (its token stops working). Another user's session
 * reads as not found, as does one already ended. Ending the current one signs this request out.
 */
export async function endOwnSession(actor: Actor, sessionId: string): Promise<{ ok: true; current: boolean }> {
  const result = await db.transaction(async (tx) => {
    const ended = await tx
      .update(sessions)
      .set({ revokedAt: new Date() })
      .where(and(eq(sessions.id, sessionId), eq(sessions.userId, actor.id), isNull(sessions.revokedAt), gt(sessions.expiresAt, sql`now()`)))
      .returning({ id: sessions.id, createdAt: sessions.createdAt, userAgent: sessions.userAgent });
    if (ended.length === 0) throw notFound('That session of yours');
    const current = sessionId === actor.sessionId;
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'session.end',
      entityType: 'user',
      entityId: actor.id,
      after: { sessionStarted: ended[0].createdAt.toISOString(), userAgent: ended[0].userAgent, thisSession: current },
    });
    return { ok: true as const, current };
  });
  forgetSession(sessionId);
  return result;
}
