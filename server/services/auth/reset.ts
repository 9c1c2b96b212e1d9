/**
 * One-time password reset links: made for an administrator (`createResetLink`), used by the
 * person it was sent to (`resetPasswordWithLink`, POST /api/auth/reset, public). Only the
 * SHA-256 of the token is stored; a link works once, until it expires (setting
 * `passwordResetHours`), and only while the account is active. Using it sets the new password
 * (checked by the password policy), ends every session of the user and every other open link.
 */
import { forgetUser } from './session-cache';
import crypto from 'node:crypto';
import { and, eq, isNull, ne } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { passwordResets, sessions, users } from '../../db/schema';
import { AppError } from '../../errors';
import type { PasswordResetInput } from '../../../shared/schemas/auth';
import { formatDateTime } from '../../../shared/plant-time';
import { config } from '../../config';
import { recordAudit } from '../audit';
import { readSetting } from '../settings';
import { enforcePasswordPolicy } from './password-policy';
import { hashPassword } from './index';

export function hashResetToken(token: string): string {
  return crypto.createHash('sha256').update(token, 'utf8').digest('hex');
}

/** A new link's token (256 random bits, URL-safe) stored hashed, in the caller's transaction. */
export async function createResetLink(tx: Tx, userId: string, createdBy: string): Promise<{ token: string; expiresAt: Date }> {
  const token = crypto.randomBytes(32).toString('base64url');
  const hours = await readSetting('passwordResetHours', tx);
  const expiresAt = new Date(Date.now() + hours * 3600 * 1000);
  await tx.insert(passwordResets).values({ userId, tokenHash: hashResetToken(token), createdBy, expiresAt });
  return { token, expiresAt };
}

function invalidLink(message: string, detail: string) {
  return new AppError('RESET_LINK_INVALID', message, 400, [{ field: 'token', message: detail }]);
}

/** Reads the link's state without changing it; throws the refusal a person can act on. */
async function usableLink(tokenHash: string, tx: Tx | typeof db, lock: boolean) {
  const query = tx
    .select({
      id: passwordResets.id,
      userId: passwordResets.userId,
      expiresAt: passwordResets.expiresAt,
      usedAt: passwordResets.usedAt,
      email: users.email,
      name: users.name,
      active: users.active,
    })
    .from(passwordResets)
    .innerJoin(users, eq(users.id, passwordResets.userId))
    .where(eq(passwordResets.tokenHash, tokenHash))
    .limit(1);
  const [row] = lock ? await query.for('update', { of: passwordResets }) : await query;
  if (!row) throw invalidLink('This reset link is not known. Ask an administrator to send a new one.', 'is not a known reset link');
  if (row.usedAt) {
    throw invalidLink(
      'This reset link was already used; each link works once. Ask an administrator to send a new one.',
      'was already used',
    );
  }
  if (row.expiresAt.getTime() <= Date.now()) {
    const at = formatDateTime(row.expiresAt, config.plantZone);
    throw invalidLink(`This reset link expired at ${at}. Ask an administrator to send a new one.`, 'has expired');
  }
  if (!row.active) {
    throw invalidLink(
      'This account is deactivated, so its reset link no longer works. Ask an administrator.',
      'belongs to a deactivated account',
    );
  }
  return row;
}

/** POST /api/auth/reset: sets the new password with a link's token, once. */
export async function resetPasswordWithLink(input: PasswordResetInput): Promise<{ ok: true; email: string }> {
  const tokenHash = hashResetToken(input.token);
  // Checked first without a lock, so a bad link or password costs no hashing and no write.
  const link = await usableLink(tokenHash, db, false);
  await enforcePasswordPolicy('newPassword', input.newPassword, { email: link.email, name: link.name });
  const passwordHash = await hashPassword(input.newPassword);
  const result = await db.transaction(async (tx) => {
    // Again under a lock: of two uses at the same moment, the second finds it used.
    const row = await usableLink(tokenHash, tx, true);
    const now = new Date();
    await tx.update(passwordResets).set({ usedAt: now }).where(eq(passwordResets.id, row.id));
    // Any other open link of this user stops working too.
    await tx
      .update(passwordResets)
      .set({ usedAt: now })
      .where(and(eq(passwordResets.userId, row.userId), isNull(passwordResets.usedAt), ne(passwordResets.id, row.id)));
    await tx.update(users).set({ passwordHash, mustChangePassword: false, updatedAt: now }).where(eq(users.id, row.userId));
    const ended = await tx
      .update(sessions)
      .set({ revokedAt: now })
      .where(and(eq(sessions.userId, row.userId), isNull(sessions.revokedAt)))
      .returning({ id: sessions.id });
    await recordAudit(tx, {
      actorId: row.userId,
      action: 'user.password_reset',
      entityType: 'user',
      entityId: row.userId,
      after: { email: row.email, sessionsEnded: ended.length },
    });
    return { ok: true as const, email: row.email, userId: row.userId };
  });
  forgetUser(result.userId);
  return { ok: true, email: result.email };
}
