import { z } from 'zod';
import {
  loginResultSchema,
  meResultSchema,
  ownSessionListSchema,
  passwordChangeResultSchema,
  sessionEndedSchema,
  type LoginInput,
  type LoginResult,
  type OwnSession,
  type PasswordChangeInput,
  type PasswordResetInput,
  type SessionUser,
} from '@shared/schemas/auth';
import { apiFetch } from './http';

const logoutResultSchema = z.object({ ok: z.literal(true) });

/**
 * POST /api/auth/login: sets the httpOnly session cookie and answers the user with their
 * permissions; 401 BAD_CREDENTIALS on a wrong password.
 */
export function login(input: LoginInput): Promise<LoginResult> {
  return apiFetch('/api/auth/login', { method: 'POST', body: input, schema: loginResultSchema });
}

/** POST /api/auth/logout: clears the session cookie. */
export async function logout(): Promise<void> {
  await apiFetch('/api/auth/logout', { method: 'POST', schema: logoutResultSchema });
}

/** GET /api/auth/me: the signed-in user and their permissions; 401 when nobody is signed in. */
export async function me(): Promise<SessionUser> {
  const result = await apiFetch('/api/auth/me', { schema: meResultSchema });
  return result.user;
}

/** POST /api/auth/password: the signed-in user's new password; their other sessions end, this one stays. */
export function changePassword(input: PasswordChangeInput): Promise<{ ok: true; endedSessions: number }> {
  return apiFetch('/api/auth/password', { method: 'POST', body: input, schema: passwordChangeResultSchema });
}

/** POST /api/auth/reset (public): sets a new password with an e-mailed link's token; every session of the person ends. */
export function resetPassword(input: PasswordResetInput): Promise<{ ok: true; email: string }> {
  return apiFetch('/api/auth/reset', { method: 'POST', body: input, schema: z.object({ ok: z.literal(true), email: z.string() }) });
}

/** GET /api/auth/sessions: the signed-in user's open sessions, this one marked `current`. */
export async function listOwnSessions(): Promise<OwnSession[]> {
  return (await apiFetch('/api/auth/sessions', { schema: ownSessionListSchema })).items;
}

/** DELETE /api/auth/sessions/:id: ends one of my sessions (`current`: it was this one, so I am signed out). */
export function endOwnSession(id: string): Promise<{ ok: true; current: boolean }> {
  return apiFetch(`/api/auth/sessions/${encodeURIComponent(id)}`, { method: 'DELETE', schema: sessionEndedSchema });
}
