import { asc } from 'drizzle-orm';
import { db } from '../../db/client';
import { users } from '../../db/schema';
import type { UserList } from '../../../shared/schemas/users';
import { requirePermission, type Actor } from '../auth/actor';

/** Every account, by e-mail (admin only). Password hashes never leave the service. */
export async function listUsers(actor: Actor): Promise<UserList> {
  requirePermission(actor, 'users.manage');
  const rows = await db
    .select({ id: users.id, email: users.email, name: users.name, roles: users.roles, active: users.active })
    .from(users)
    .orderBy(asc(users.email));
  return { items: rows };
}
