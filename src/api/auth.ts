import { z } from 'zod';
import { loginResultSchema, meResultSchema, type LoginInput, type LoginResult, type SessionUser } from '@shared/schemas/auth';
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
