import {
  createUserResultSchema,
  passwordResetSentSchema,
  userListSchema,
  userResultSchema,
  type CreateUserInput,
  type CreateUserResult,
  type PasswordResetSent,
  type UpdateUserInput,
  type UserListItem,
} from '@shared/schemas/users';
import { apiFetch } from './http';

/** GET /api/users (admin): every account with its roles, state, last sign-in and open sessions. */
export async function listUsers(): Promise<UserListItem[]> {
  return (await apiFetch('/api/users', { schema: userListSchema })).items;
}

/** POST /api/users (admin): without a password the answer carries a temporary one, shown this once. */
export function createUser(input: CreateUserInput): Promise<CreateUserResult> {
  return apiFetch('/api/users', { method: 'POST', body: input, schema: createUserResultSchema });
}

/** PATCH /api/users/:id (admin): roles, name, active (deactivating ends the person's sessions). */
export async function updateUser(id: string, patch: UpdateUserInput): Promise<UserListItem> {
  return (await apiFetch(`/api/users/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch, schema: userResultSchema })).user;
}

/** POST /api/users/:id/password-reset (admin): e-mails a one-time link to set a new password. */
export function sendPasswordReset(id: string): Promise<PasswordResetSent> {
  return apiFetch(`/api/users/${encodeURIComponent(id)}/password-reset`, { method: 'POST', schema: passwordResetSentSchema });
}
