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

/** The actor for a user id from a session token; null when the user is gone or disabled. */
export async function actorForUserId(userId: string): Promise<Actor | null> {
  const [row] = await db.select().from(users).where(eq(users.id, userId)).limit(1);
  if (!row || !row.active) return null;
  return toUser(row);
}
