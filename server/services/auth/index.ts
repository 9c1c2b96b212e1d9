import bcrypt from 'bcryptjs';
import { and, eq, gt, isNull, lt, ne, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { sessions, users } from '../../db/schema';
import { config } from '../../config';
import { AppError } from '../../errors';
import type { LoginInput, PasswordChangeInput, User } from '../../../shared/schemas/auth';
import type { Actor } from './actor';
import { signSessionToken, type SessionClaims } from './tokens';
import { recordAudit } from '../audit';
import { logger } from '../../logger';
import { cacheGeneration, cachedActor, forgetSession, forgetUser, remember } from './session-cache';
import { enforcePasswordPolicy } from './password-policy';
import { noteSessionSeen } from './activity';

// A hash to compare against when the e-mail is unknown, so both paths take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10);

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, 10);
}

function toUser(row: Pick<typeof users.$inferSelect, 'id' | 'email' | 'name' | 'roles' | 'mustChangePassword'>): User & {
  mustChangePassword: boolean;
} {
  return { id: row.id, email: row.email, name: row.name, roles: row.roles, mustChangePassword: row.mustChangePassword };
}

/** Where a session was started from, as the sessions list shows it (both optional). */
export interface SessionOrigin {
  userAgent?: string | null;
  ip?: string | null;
}

/** Longest User-Agent kept (some are very long; the list shows the start). */
const USER_AGENT_MAX = 300;

let lastPrune = 0;

/** Drops session rows past their expiry (their tokens have expired too), at most once an hour per process. */
function pruneExpiredSessions(): void {
  if (Date.now() - lastPrune < 3600 * 1000) return;
  lastPrune = Date.now();
  db.delete(sessions)
    .where(lt(sessions.expiresAt, sql`now()`))
    .then(
      () => undefined,
      (err: unknown) => logger.error({ err }, 'pruning expired sessions failed'),
    );
}

/** A new session row for the user and its signed token (valid for TACKLOG_SESSION_HOURS). */
export async function createSession(userId: string, origin: SessionOrigin = {}): Promise<{ token: string; sessionId: string }> {
  pruneExpiredSessions();
  const expiresAt = new Date(Date.now() + config.sessionHours * 3600 * 1000);
  const [row] = await db
    .insert(sessions)
    .values({ userId, expiresAt, userAgent: origin.userAgent?.slice(0, USER_AGENT_MAX) || null, ip: origin.ip || null })
    .returning({ id: sessions.id });
  return { token: signSessionToken(userId, row.id), sessionId: row.id };
}

export async function login(
  input: LoginInput,
  origin: SessionOrigin = {},
): Promise<{ token: string; user: User & { mustChangePassword: boolean } }> {
  const [row] = await db
    .select()
    .from(users)
    .where(eq(sql`lower(${users.email})`, input.email.toLowerCase()))
    .limit(1);
  const ok = await bcrypt.compare(input.password, row?.passwordHash ?? DUMMY_HASH);
  if (!row || !ok || !row.active) {
    throw new AppError('BAD_CREDENTIALS', 'The e-mail or password is not right.', 401);
  }
  const { token } = await createSession(row.id, origin);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, row.id));
    await recordAudit(tx, { actorId: row.id, action: 'login', entityType: 'user', entityId: row.id });
  });
  return { token, user: toUser(row) };
}

/**
 * Every signed-in request runs this: one named prepared statement, so each pooled connection
 * parses and plans it once (session by primary key joined to its user, only what an actor needs).
 */
const actorBySession = db
  .select({
    id: users.id,
    email: users.email,
    name: users.name,
    roles: users.roles,
    mustChangePassword: users.mustChangePassword,
    expiresAt: sessions.expiresAt,
  })
  .from(sessions)
  .innerJoin(users, eq(users.id, sessions.userId))
  .where(
    and(
      eq(sessions.id, sql.placeholder('sessionId')),
      eq(sessions.userId, sql.placeholder('userId')),
      isNull(sessions.revokedAt),
      gt(sessions.expiresAt, sql`now()`),
      eq(users.active, true),
    ),
  )
  .limit(1)
  .prepare('auth_actor_by_session');

/**
 * The actor for a session token's claims: remembered by this process (see session-cache.ts), or
 * one indexed lookup (session by primary key joined to its user). Null when the session was
 * revoked or has expired, or the user is gone or disabled.
 */
export async function actorForSession(claims: SessionClaims): Promise<Actor | null> {
  const known = cachedActor(claims.sessionId, claims.userId);
  if (known) {
    noteSessionSeen(claims.sessionId);
    return known;
  }
  const readAt = cacheGeneration();
  const [row] = await actorBySession.execute({ sessionId: claims.sessionId, userId: claims.userId });
  if (!row) return null;
  noteSessionSeen(claims.sessionId);
  const actor: Actor = { ...toUser(row), sessionId: claims.sessionId };
  remember(claims.sessionId, actor, row.expiresAt, readAt);
  return actor;
}

/** POST /api/auth/logout: this session's token (bearer or cookie) stops working at once. */
export async function logout(actor: Actor): Promise<void> {
  if (!actor.sessionId) return;
  await db.transaction(async (tx) => {
    const ended = await tx
      .update(sessions)
      .set({ revokedAt: new Date() })
      .where(and(eq(sessions.id, actor.sessionId!), isNull(sessions.revokedAt)))
      .returning({ id: sessions.id });
    if (ended.length) await recordAudit(tx, { actorId: actor.id, action: 'logout', entityType: 'user', entityId: actor.id });
  });
  forgetSession(actor.sessionId);
}

/**
 * POST /api/auth/password: checks the current password, stores the new one and ends every other
 * session of this user (a token someone else may hold stops working); this session stays.
 */
export async function changePassword(actor: Actor, input: PasswordChangeInput): Promise<{ endedSessions: number }> {
  const [row] = await db
    .select({ passwordHash: users.passwordHash, email: users.email, name: users.name })
    .from(users)
    .where(eq(users.id, actor.id))
    .limit(1);
  if (!row || !(await bcrypt.compare(input.currentPassword, row.passwordHash))) {
    throw new AppError('VALIDATION_FAILED', 'The current password is not right.', 400, [
      { field: 'currentPassword', message: 'is not right' },
    ]);
  }
  if (input.currentPassword === input.newPassword) {
    throw new AppError('VALIDATION_FAILED', 'The new password must differ from the current one.', 400, [
      { field: 'newPassword', message: 'must differ from the current password' },
    ]);
  }
  await enforcePasswordPolicy('newPassword', input.newPassword, { email: row.email, name: row.name });
  const passwordHash = await hashPassword(input.newPassword);
  const result = await db.transaction(async (tx) => {
    const now = new Date();
    await tx.update(users).set({ passwordHash, mustChangePassword: false, updatedAt: now }).where(eq(users.id, actor.id));
    const others = actor.sessionId ? ne(sessions.id, actor.sessionId) : undefined;
    const ended = await tx
      .update(sessions)
      .set({ revokedAt: now })
      .where(and(eq(sessions.userId, actor.id), isNull(sessions.revokedAt), others))
      .returning({ id: sessions.id });
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'user.password_change',
      entityType: 'user',
      entityId: actor.id,
      after: { otherSessionsEnded: ended.length },
    });
    return { endedSessions: ended.length };
  });
  forgetUser(actor.id);
  return result;
}
