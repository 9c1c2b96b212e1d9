/**
 * Each user's e-mail choices (GET/PUT /api/me/notifications, and an administrator's view of
 * anyone's under /api/users/:id/notifications). Changes are audited.
 */
import { eq } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { notificationSettings, users } from '../../db/schema';
import { ALERT_KINDS, type AlertKind, type Role } from '../../../shared/constants';
import { defaultModes, effectiveModes, kindsFor, type NotificationMode } from '../../../shared/notifications';
import type { NotificationSettings, NotificationSettingsInput } from '../../../shared/schemas/notifications';
import { can } from '../../../shared/permissions';
import { fieldError, forbidden, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { recordAudit } from '../audit';

export interface StoredChoices {
  modes: Partial<Record<string, NotificationMode>>;
  whenResolved: boolean;
}

/** What a user chose (nothing stored: their roles' defaults). */
export async function storedChoices(tx: DbOrTx, userId: string): Promise<StoredChoices> {
  const [row] = await tx.select().from(notificationSettings).where(eq(notificationSettings.userId, userId));
  return { modes: row?.modes ?? {}, whenResolved: row?.whenResolved ?? false };
}

function present(user: { id: string; name: string; email: string; roles: Role[] }, choices: StoredChoices): NotificationSettings {
  const available = kindsFor(user.roles);
  const modes = effectiveModes(user.roles, choices.modes);
  // A kind the user cannot see (their roles changed since) is not e-mailed.
  for (const k of ALERT_KINDS) if (!available.includes(k)) modes[k] = 'none';
  return {
    user: { id: user.id, name: user.name, email: user.email, roles: user.roles },
    kinds: modes,
    defaults: defaultModes(user.roles),
    chosen: Object.fromEntries(Object.entries(choices.modes).filter(([k]) => (ALERT_KINDS as readonly string[]).includes(k))) as Partial<
      Record<AlertKind, NotificationMode>
    >,
    available,
    whenResolved: choices.whenResolved,
  };
}

async function loadUser(tx: DbOrTx, userId: string) {
  const [user] = await tx
    .select({ id: users.id, name: users.name, email: users.email, roles: users.roles })
    .from(users)
    .where(eq(users.id, userId));
  if (!user) throw notFound('That user');
  return user;
}

/** Only the user themself, or whoever may manage everyone's notifications (admin). */
function requireSelfOrManager(actor: Actor, userId: string): void {
  if (actor.id !== userId && !can(actor.roles, 'notifications.manageAll'))
    throw forbidden("Only an administrator can see or change another person's notifications.");
}

export async function getNotificationSettings(actor: Actor, userId: string): Promise<NotificationSettings> {
  requireSelfOrManager(actor, userId);
  const user = await loadUser(db, userId);
  return present(user, await storedChoices(db, userId));
}

/**
 * Replaces the user's choices with `input.kinds` (a kind left out follows the default of the
 * user's roles) and, when given, `whenResolved`. A kind that does not concern the user's roles
 * can only be set to "no e-mail".
 */
export async function putNotificationSettings(
  actor: Actor,
  userId: string,
  input: NotificationSettingsInput,
): Promise<NotificationSettings> {
  requireSelfOrManager(actor, userId);
  return db.transaction(async (tx) => {
    const user = await loadUser(tx, userId);
    const available = kindsFor(user.roles);
    for (const [kind, mode] of Object.entries(input.kinds)) {
      if (mode !== 'none' && !available.includes(kind as AlertKind)) {
        throw fieldError(
          `kinds.${kind}`,
          `does not concern ${actor.id === userId ? 'your' : "this user's"} roles: only "none" can be chosen.`,
        );
      }
    }
    const [locked] = await tx.select().from(notificationSettings).where(eq(notificationSettings.userId, userId)).for('update');
    const before: StoredChoices = { modes: locked?.modes ?? {}, whenResolved: locked?.whenResolved ?? false };
    const after: StoredChoices = { modes: { ...input.kinds }, whenResolved: input.whenResolved ?? before.whenResolved };
    const now = new Date();
    await tx
      .insert(notificationSettings)
      .values({
        userId,
        modes: after.modes as Record<string, NotificationMode>,
        whenResolved: after.whenResolved,
        updatedAt: now,
        updatedBy: actor.id,
      })
      .onConflictDoUpdate({
        target: notificationSettings.userId,
        set: {
          modes: after.modes as Record<string, NotificationMode>,
          whenResolved: after.whenResolved,
          updatedAt: now,
          updatedBy: actor.id,
        },
      });
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'notifications.change',
      entityType: 'user',
      entityId: userId,
      before,
      after,
    });
    return present(user, after);
  });
}
