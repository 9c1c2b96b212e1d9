import { forgetUser } from '../auth/session-cache';
import { and, asc, arrayContains, eq, isNull, sql } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { sessions, users } from '../../db/schema';
import type { UpdateUserInput, UserListItem } from '../../../shared/schemas/users';
import type { Role } from '../../../shared/constants';
import { roleWord } from '../../../shared/words';
import { requirePermission, type Actor } from '../auth/actor';
import { conflict, notFound } from '../../errors';
import { recordAudit } from '../audit';
import { userItem } from './list';

const sameRoles = (a: readonly Role[], b: readonly Role[]) => a.length === b.length && a.every((r) => b.includes(r));

/** One lock all changes of users queue on (they are an administrator's rare acts). */
const USER_CHANGE_LOCK = 7226012;

/**
 * Queues behind any other change of users, then locks every active administrator and the target,
 * and returns the administrators' ids and the target row. Row locks alone, even in id order, let
 * two changes deadlock: a row that stops being an administrator under one change drops out of
 * the other's locked set, which then takes the target's row out of order.
 */
async function lockForChange(tx: Tx, id: string) {
  await tx.execute(sql`SELECT pg_advisory_xact_lock(${USER_CHANGE_LOCK})`);
  const admins = await tx
    .select({ id: users.id })
    .from(users)
    .where(and(eq(users.active, true), arrayContains(users.roles, ['admin'])))
    .orderBy(asc(users.id))
    .for('update');
  const [target] = await tx
    .select({ id: users.id, email: users.email, name: users.name, roles: users.roles, active: users.active })
    .from(users)
    .where(eq(users.id, id))
    .for('update');
  return { adminIds: admins.map((a) => a.id), target };
}

/** Ends every session of a user at once (their tokens stop working with the next request). */
async function endAllSessions(tx: Tx, userId: string, at: Date): Promise<number> {
  const ended = await tx
    .update(sessions)
    .set({ revokedAt: at })
    .where(and(eq(sessions.userId, userId), isNull(sessions.revokedAt)))
    .returning({ id: sessions.id });
  return ended.length;
}

/**
 * PATCH /api/users/:id: roles, name, active. Deactivating ends the user's sessions at once.
 * Refused: deactivating oneself (CANNOT_DEACTIVATE_SELF), and any change that would leave no
 * active administrator (LAST_ADMIN). Roles take effect with the user's next request.
 */
export async function updateUser(actor: Actor, id: string, input: UpdateUserInput): Promise<{ user: UserListItem }> {
  requirePermission(actor, 'users.manage');
  const result = await db.transaction(async (tx) => {
    const { adminIds, target } = await lockForChange(tx, id);
    if (!target) throw notFound('User');
    const nextActive = input.active ?? target.active;
    const nextRoles = input.roles ?? target.roles;
    const nextName = input.name ?? target.name;

    if (input.active === false && target.active && target.id === actor.id) {
      throw conflict('CANNOT_DEACTIVATE_SELF', 'You cannot deactivate your own account. Another administrator can, if it must be done.', [
        { field: 'active', message: 'cannot be false for your own account' },
      ]);
    }
    const staysAdmin = nextActive && nextRoles.includes('admin');
    if (adminIds.includes(target.id) && !staysAdmin && adminIds.length <= 1) {
      const field = input.active === false ? 'active' : 'roles';
      throw conflict(
        'LAST_ADMIN',
        `${target.name} is the only active administrator; make someone else an administrator first, so the plant can still manage users.`,
        [{ field, message: 'would leave no active administrator' }],
      );
    }

    const now = new Date();
    const rolesChanged = !sameRoles(nextRoles, target.roles);
    const nameChanged = nextName !== target.name;
    const activeChanged = nextActive !== target.active;
    if (rolesChanged || nameChanged || activeChanged) {
      await tx.update(users).set({ roles: nextRoles, name: nextName, active: nextActive, updatedAt: now }).where(eq(users.id, id));
    }
    if (rolesChanged || nameChanged) {
      await recordAudit(tx, {
        actorId: actor.id,
        action: 'user.update',
        entityType: 'user',
        entityId: id,
        before: {
          email: target.email,
          ...(nameChanged ? { name: target.name } : {}),
          ...(rolesChanged ? { roles: target.roles.map(roleWord).join(', ') } : {}),
        },
        after: {
          email: target.email,
          ...(nameChanged ? { name: nextName } : {}),
          ...(rolesChanged ? { roles: nextRoles.map(roleWord).join(', ') } : {}),
        },
      });
    }
    if (activeChanged) {
      const sessionsEnded = nextActive ? 0 : await endAllSessions(tx, id, now);
      await recordAudit(tx, {
        actorId: actor.id,
        action: nextActive ? 'user.reactivate' : 'user.deactivate',
        entityType: 'user',
        entityId: id,
        before: { email: target.email, active: target.active },
        after: { email: target.email, active: nextActive, ...(nextActive ? {} : { sessionsEnded }) },
      });
    }
    return { user: await userItem(tx, id) };
  });
  // This process forgets the user's sessions at once; the others hear of it at commit (session-cache.ts).
  forgetUser(id);
  return result;
}
