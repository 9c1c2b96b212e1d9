import { z } from 'zod';
import { ROLES } from '../constants';
import { idSchema } from './common';

export const roleSchema = z.enum(ROLES);

/**
 * A new password as a form sends it: present and not absurdly long. The plant's policy (minimum
 * length setting, common passwords) is checked by the server in one place
 * (server/services/auth/password-policy.ts), naming the same field.
 */
export const newPasswordSchema = z.string({ error: 'is required' }).min(1, 'is required').max(200, 'must be at most 200 characters');

export const loginInputSchema = z.object({
  email: z.string().trim().toLowerCase().email('must be an e-mail address'),
  password: z.string().min(1, 'is required').max(200, 'is too long'),
});
export type LoginInput = z.infer<typeof loginInputSchema>;

/** POST /api/auth/password. */
export const passwordChangeInputSchema = z.object({
  currentPassword: z.string({ error: 'is required' }).min(1, 'is required').max(200, 'is too long'),
  newPassword: newPasswordSchema,
});
export type PasswordChangeInput = z.infer<typeof passwordChangeInputSchema>;

/** POST /api/auth/reset (public): the token from the e-mailed link and the new password. */
export const passwordResetInputSchema = z.object({
  token: z.string({ error: 'is required' }).trim().min(20, 'is not a reset link token').max(200, 'is not a reset link token'),
  newPassword: newPasswordSchema,
});
export type PasswordResetInput = z.infer<typeof passwordResetInputSchema>;

/** One of the signed-in user's open sessions (GET /api/auth/sessions). */
export const ownSessionSchema = z.object({
  id: idSchema,
  startedAt: z.string(),
  /** Last request seen with it (to the minute); null when none was recorded. */
  lastSeenAt: z.string().nullable(),
  expiresAt: z.string(),
  userAgent: z.string().nullable(),
  ip: z.string().nullable(),
  /** The session this request came with. */
  current: z.boolean(),
});
export type OwnSession = z.infer<typeof ownSessionSchema>;
export const ownSessionListSchema = z.object({ items: z.array(ownSessionSchema) });

/** DELETE /api/auth/sessions/:id → whether it was the session of this request (then the caller is signed out). */
export const sessionEndedSchema = z.object({ ok: z.literal(true), current: z.boolean() });

export const passwordChangeResultSchema = z.object({ ok: z.literal(true), endedSessions: z.number().int().nonnegative() });

export const userSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
});
export type User = z.infer<typeof userSchema>;

/**
 * The signed-in user with the actions the permission map allows them (`shared/permissions.ts`),
 * as sent by sign-in and by GET /api/auth/me. The client shows and hides controls from
 * `permissions`; the server checks every request again.
 */
export const sessionUserSchema = userSchema.extend({
  permissions: z.array(z.string()),
  /** True after an administrator made the account with a temporary password: nothing else works until it is changed. */
  mustChangePassword: z.boolean().optional(),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

/** POST /api/auth/login → {token, user: {id, email, name, roles, permissions}}. */
export const loginResultSchema = z.object({ token: z.string(), user: sessionUserSchema });
export type LoginResult = z.infer<typeof loginResultSchema>;

export const meResultSchema = z.object({ user: sessionUserSchema });
