import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import { loginInputSchema, passwordChangeInputSchema, passwordResetInputSchema } from '../../shared/schemas/auth';
import { idSchema } from '../../shared/schemas/common';
import { endpoint } from '../http';
import { changePassword, login, logout } from '../services/auth';
import { endOwnSession, listOwnSessions } from '../services/auth/sessions';
import { resetPasswordWithLink } from '../services/auth/reset';
import { SESSION_COOKIE } from '../services/auth/tokens';
import { config } from '../config';
import { sendError } from '../middleware/errors';
import { permissionsFor } from '../../shared/permissions';

export const authRouter = Router();

/** Attempts per client address (req.ip: the socket's address unless TACKLOG_TRUST_PROXY names a proxy). */
function attemptLimiter() {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: config.loginRateLimit,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    // Without a trusted proxy X-Forwarded-For is ignored on purpose (anyone can send it).
    validate: { xForwardedForHeader: false },
    handler: (_req, res) => {
      sendError(res, 'TOO_MANY_ATTEMPTS', 'Too many sign-in attempts; wait a few minutes and try again.');
    },
  });
}

authRouter.post(
  '/login',
  attemptLimiter(),
  endpoint({ access: 'public', body: loginInputSchema }, async ({ body, req, res }) => {
    const result = await login(body, { userAgent: req.get('user-agent'), ip: req.ip });
    res.cookie(SESSION_COOKIE, result.token, {
      httpOnly: true,
      sameSite: 'strict',
      secure: config.secureCookies,
      maxAge: config.sessionHours * 3600 * 1000,
      path: '/',
    });
    return { token: result.token, user: { ...result.user, permissions: permissionsFor(result.user.roles) } };
  }),
);

/** Ends this session: the token (bearer or cookie) no longer works. Without a session it only clears the cookie. */
authRouter.post(
  '/logout',
  endpoint({ access: 'public' }, async ({ actor, res }) => {
    if (actor) await logout(actor);
    res.clearCookie(SESSION_COOKIE, { path: '/' });
    return { ok: true };
  }),
);

/** Changes the signed-in user's password and ends their other sessions. */
authRouter.post(
  '/password',
  attemptLimiter(),
  endpoint({ access: 'signed-in', beforePasswordChange: true, body: passwordChangeInputSchema }, async ({ actor, body }) => {
    const { endedSessions } = await changePassword(actor, body);
    return { ok: true, endedSessions };
  }),
);

/** Sets a new password with the token of an e-mailed reset link (public: the person is signed out); ends all their sessions. */
authRouter.post(
  '/reset',
  attemptLimiter(),
  endpoint({ access: 'public', body: passwordResetInputSchema }, ({ body }) => resetPasswordWithLink(body)),
);

/** The signed-in user's open sessions, this one marked. */
authRouter.get(
  '/sessions',
  endpoint({ access: 'signed-in', beforePasswordChange: true }, ({ actor }) => listOwnSessions(actor)),
);

/** Ends one of the signed-in user's own sessions (this one too: then the cookie goes as well). */
authRouter.delete(
  '/sessions/:id',
  endpoint({ access: 'signed-in', beforePasswordChange: true, params: z.object({ id: idSchema }) }, async ({ actor, params, res }) => {
    const result = await endOwnSession(actor, params.id);
    if (result.current) res.clearCookie(SESSION_COOKIE, { path: '/' });
    return result;
  }),
);

authRouter.get(
  '/me',
  endpoint({ access: 'signed-in', beforePasswordChange: true }, ({ actor }) => ({
    user: {
      id: actor.id,
      email: actor.email,
      name: actor.name,
      roles: actor.roles,
      permissions: permissionsFor(actor.roles),
      mustChangePassword: actor.mustChangePassword ?? false,
    },
  })),
);
