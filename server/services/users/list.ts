import { asc, eq, sql, type SQL } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { users } from '../../db/schema';
import type { UserList, UserListItem } from '../../../shared/schemas/users';
import { requirePermission, type Actor } from '../auth/actor';
import { notFound } from '../../errors';

// Written out in full: inside a sub-select drizzle would name the column without its table, and
// "id" would then mean the session's own id.
const userId = sql.raw('"users"."id"');

/** Open sessions (neither ended nor expired) and the newest sign-in, per user, beside the user's columns. */
const columns = {
  id: users.id,
  email: users.email,
  name: users.name,
  roles: users.roles,
  active: users.active,
  mustChangePassword: users.mustChangePassword,
  createdAt: users.createdAt,
  openSessions: sql<number>`(SELECT count(*)::int FROM sessions s WHERE s.user_id = ${userId} AND s.revoked_at IS NULL AND s.expires_at > now())`,
  // Recorded at each sign-in; for accounts that signed in before that was kept, the newest session.
  lastSignInAt: sql<Date | null>`coalesce(${users.lastSignInAt}, (SELECT max(s.created_at) FROM sessions s WHERE s.user_id = ${userId}))`,
};

type Row = { [K in keyof typeof columns]: unknown } & {
  id: string;
  email: string;
  name: string;
  roles: UserListItem['roles'];
  active: boolean;
  mustChangePassword: boolean;
  createdAt: Date;
  openSessions: number;
  lastSignInAt: Date | string | null;
};

function toItem(r: Row): UserListItem {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    roles: r.roles,
    active: r.active,
    mustChangePassword: r.mustChangePassword,
    createdAt: r.createdAt.toISOString(),
    openSessions: Number(r.openSessions),
    lastSignInAt: r.lastSignInAt === null ? null : new Date(r.lastSignInAt).toISOString(),
  };
}

async function selectUsers(tx: DbOrTx, where?: SQL): Promise<UserListItem[]> {
  const rows = await tx.select(columns).from(users).where(where).orderBy(asc(users.email));
  return rows.map((r) => toItem(r as Row));
}

/** Every account, by e-mail (admin only), with its open sessions and last sign-in. Password hashes never leave the service. */
export async function listUsers(actor: Actor): Promise<UserList> {
  requirePermission(actor, 'users.manage');
  return { items: await selectUsers(db) };
}

/** One account as the list shows it (in the caller's transaction); 404 when there is none. */
export async function userItem(tx: DbOrTx, id: string): Promise<UserListItem> {
  const [item] = await selectUsers(tx, eq(users.id, id));
  if (!item) throw notFound('User');
  return item;
}
