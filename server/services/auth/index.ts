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
 * Every signed-in request runs this: one named prepared statement, so each pooled connection
 * parses and plans it once (only the columns an actor needs).
 */
const actorById = db
  .select({ id: users.id, email: users.email, name: users.name, roles: users.roles, active: users.active })
  .from(users)
  .where(eq(users.id, sql.placeholder('id')))
  .limit(1)
  .prepare('auth_actor_by_id');

/** The actor for a user id from a session token; null when the user is gone or disabled. */
export async function actorForUserId(userId: string): Promise<Actor | null> {
  const [row] = await actorById.execute({ id: userId });
  if (!row || !row.active) return null;
  return { id: row.id, email: row.email, name: row.name, roles: row.roles };
}
