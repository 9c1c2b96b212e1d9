import bcrypt from 'bcryptjs';
import { eq, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { users } from '../../db/schema';
import { AppError } from '../../errors';
import type { LoginInput, User } from '../../../shared/schemas/auth';
import type { Actor } from './actor';
import { signSessionToken } from './tokens';
import { recordAudit } from '../audit';

// A hash to compare against when the e-mail is unknown, so both paths take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10);

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, 10);
}

function toUser(row: typeof users.$inferSelect): User {
  return { id: row.id, email: row.email, name: row.name, roles: row.roles };
}

export async function login(input: LoginInput): Promise<{ token: string; user: User }> {
  const [row] = await db.select().from(users).where(eq(sql`lower(${users.email})`, input.email.toLowerCase())).limit(1);
  const ok = await bcrypt.compare(input.password, row?.passwordHash ?? DUMMY_HASH);
  if (!row || !ok || !row.active) {
    throw new AppError('BAD_CREDENTIALS', 'The e-mail or password is not right.', 401);
  }
  await recordAudit(db, { actorId: row.id, action: 'login', entityType: 'user', entityId: row.id });
  return { token: signSessionToken(row.id), user: toUser(row) };
}

/**
 * Signed-in users seen in the last few seconds: every request checks its session against the
 * users table, and a station scanning fast should not pay a lookup per scan. A change of roles
 * or a disabled account takes effect within ACTOR_CACHE_MS.
 */
const ACTOR_CACHE_MS = 10_000;
const ACTOR_CACHE_MAX = 1000;
const actorCache = new Map<string, { actor: Actor | null; until: number }>();

/** Forgets cached sign-ins (after a change to users, or in tests). */
export function forgetActors(userId?: string): void {
  if (userId) actorCache.delete(userId);
  else actorCache.clear();
}

/** The actor for a user id from a session token; null when the user is gone or disabled. */
export async function actorForUserId(userId: string): Promise<Actor | null> {
  const now = Date.now();
  const hit = actorCache.get(userId);
  if (hit && hit.until > now) return hit.actor;
  const [row] = await db.select().from(users).where(eq(users.id, userId)).limit(1);
  const actor = row && row.active ? toUser(row) : null;
  if (actorCache.size >= ACTOR_CACHE_MAX) actorCache.clear();
  actorCache.set(userId, { actor, until: now + ACTOR_CACHE_MS });
  return actor;
}
