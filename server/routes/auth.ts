import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import { loginInputSchema } from '../../shared/schemas/auth';
import { endpoint } from '../http';
import { login } from '../services/auth';
import { SESSION_COOKIE } from '../services/auth/tokens';
import { config } from '../config';
import { sendError } from '../middleware/errors';
import { permissionsFor } from '../../shared/permissions';

export const authRouter = Router();

const loginLimiter = rateLimit({
  windowMs: 15 * 60 * 1000,
  limit: config.loginRateLimit,
  standardHeaders: 'draft-7',
  legacyHeaders: false,
  handler: (_req, res) => {
    sendError(res, 'TOO_MANY_ATTEMPTS', 'Too many sign-in attempts; wait a few minutes and try again.');
  },
});

authRouter.post(
  '/login',
  loginLimiter,
  endpoint({ access: 'public', body: loginInputSchema }, async ({ body, res }) => {
    const result = await login(body);
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

authRouter.post(
  '/logout',
  endpoint({ access: 'public' }, ({ res }) => {
    res.clearCookie(SESSION_COOKIE, { path: '/' });
    return { ok: true };
  }),
);

authRouter.get(
  '/me',
  endpoint({ access: 'signed-in' }, ({ actor }) => ({ user: { ...actor, permissions: permissionsFor(actor.roles) } })),
);
