import { z } from 'zod';
import { listOf } from './common';
import { newPasswordSchema, roleSchema, userSchema } from './auth';

/** A person with an account, as the admin's user list shows it. */
export const userListItemSchema = userSchema.extend({
  active: z.boolean(),
  /** Signed in with a temporary password that has not been changed yet. */
  mustChangePassword: z.boolean(),
  /** Last sign-in, when known. */
  lastSignInAt: z.string().nullable(),
  /** Sessions neither ended nor expired. */
  openSessions: z.number().int().nonnegative(),
  createdAt: z.string(),
});
export type UserListItem = z.infer<typeof userListItemSchema>;

/** GET /api/users → {items: [UserListItem]} (admin only). */
export const userListSchema = listOf(userListItemSchema);
export type UserList = z.infer<typeof userListSchema>;

const nameSchema = z.string({ error: 'is required' }).trim().min(1, 'is required').max(120, 'must be at most 120 characters');
/** At least one role: to stop someone signing in, deactivate the account instead. */
const rolesSchema = z
  .array(roleSchema, { error: 'must be a list of roles' })
  .min(1, 'choose at least one role')
  .max(20, 'has too many entries')
  .transform((roles) => [...new Set(roles)]);

/** POST /api/users: without a password the server makes a temporary one, shown once in the answer. */
export const createUserInputSchema = z.object({
  email: z.string({ error: 'is required' }).trim().toLowerCase().max(254, 'is too long').email('must be an e-mail address'),
  name: nameSchema,
  roles: rolesSchema,
  password: newPasswordSchema.optional(),
});
export type CreateUserInput = z.infer<typeof createUserInputSchema>;

/** POST /api/users → 201 {user, temporaryPassword?}: the temporary password is in this answer only. */
export const createUserResultSchema = z.object({ user: userListItemSchema, temporaryPassword: z.string().optional() });
export type CreateUserResult = z.infer<typeof createUserResultSchema>;

/** PATCH /api/users/:id: any of roles, active, name (at least one). */
export const updateUserInputSchema = z
  .object({ roles: rolesSchema.optional(), active: z.boolean({ error: 'must be true or false' }).optional(), name: nameSchema.optional() })
  .refine((v) => v.roles !== undefined || v.active !== undefined || v.name !== undefined, {
    message: 'name at least one of roles, active, name',
    path: ['roles'],
  });
export type UpdateUserInput = z.infer<typeof updateUserInputSchema>;

export const userResultSchema = z.object({ user: userListItemSchema });

/** POST /api/users/:id/password-reset → where the one-time link went and until when it works. */
export const passwordResetSentSchema = z.object({ sentTo: z.string(), expiresAt: z.string() });
export type PasswordResetSent = z.infer<typeof passwordResetSentSchema>;
