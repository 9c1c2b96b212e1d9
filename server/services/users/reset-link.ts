import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { users } from '../../db/schema';
import type { PasswordResetSent } from '../../../shared/schemas/users';
import { requirePermission, type Actor } from '../auth/actor';
import { conflict, notFound } from '../../errors';
import { recordAudit } from '../audit';
import { createResetLink } from '../auth/reset';
import { queueEmail } from '../mail/outbox';
import { mailQueued } from '../mail/worker';
import { renderPasswordResetMail } from '../mail/templates/password-reset';
import { mailContext } from '../notifications/context';
import { link } from '../mail/templates/layout';

/**
 * POST /api/users/:id/password-reset: e-mails the person a one-time link to set a new password
 * (through the outbox, in the same transaction as the link). The password stays as it is until
 * the link is used; the token is in the e-mail only (stored hashed, never in the audit trail).
 */
export async function sendPasswordReset(actor: Actor, id: string): Promise<PasswordResetSent> {
  requirePermission(actor, 'users.manage');
  const ctx = await mailContext();
  const sent = await db.transaction(async (tx) => {
    const [user] = await tx
      .select({ id: users.id, email: users.email, name: users.name, active: users.active })
      .from(users)
      .where(eq(users.id, id))
      .for('update');
    if (!user) throw notFound('User');
    if (!user.active)
      throw conflict('USER_DEACTIVATED', `${user.name}'s account is deactivated; reactivate it before sending a reset link.`);
    const { token, expiresAt } = await createResetLink(tx, user.id, actor.id);
    const url = link(ctx, `/reset-password?token=${encodeURIComponent(token)}`);
    const mail = renderPasswordResetMail(ctx, { recipientName: user.name, sentBy: actor.name, url, expiresAt });
    await queueEmail(tx, {
      kind: 'password_reset',
      to: [user.email],
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      recipientUserId: user.id,
    });
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'user.password_reset_sent',
      entityType: 'user',
      entityId: user.id,
      after: { email: user.email, linkExpiresAt: expiresAt.toISOString() },
    });
    return { sentTo: user.email, expiresAt: expiresAt.toISOString() };
  });
  mailQueued();
  return sent;
}
