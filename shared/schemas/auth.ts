import { z } from 'zod';
import { ROLES } from '../constants';
import { idSchema } from './common';

export const roleSchema = z.enum(ROLES);

export const loginInputSchema = z.object({
  email: z.string().trim().toLowerCase().email('must be an e-mail address'),
  password: z.string().min(1, 'is required').max(200, 'is too long'),
});
export type LoginInput = z.infer<typeof loginInputSchema>;

/** POST /api/auth/password. */
export const passwordChangeInputSchema = z.object({
  currentPassword: z.string({ error: 'is required' }).min(1, 'is required').max(200, 'is too long'),
  newPassword: z.string({ error: 'is required' }).min(10, 'must be at least 10 characters').max(200, 'must be at most 200 characters'),
});
export type PasswordChangeInput = z.infer<typeof passwordChangeInputSchema>;

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
export const sessionUserSchema = userSchema.extend({ permissions: z.array(z.string()) });
export type SessionUser = z.infer<typeof sessionUserSchema>;

/** POST /api/auth/login → {token, user: {id, email, name, roles, permissions}}. */
export const loginResultSchema = z.object({ token: z.string(), user: sessionUserSchema });
export type LoginResult = z.infer<typeof loginResultSchema>;

export const meResultSchema = z.object({ user: sessionUserSchema });
