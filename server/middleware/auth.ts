import type { RequestHandler } from 'express';
import { SESSION_COOKIE, verifySessionToken } from '../services/auth/tokens';
import { actorForSession } from '../services/auth';

/** Reads a bearer token or the session cookie and attaches the signed-in actor, if any. */
export const attachActor: RequestHandler = async (req, _res, next) => {
  try {
    const header = req.get('authorization');
    let token: string | undefined;
    if (header?.toLowerCase().startsWith('bearer ')) {
      token = header.slice(7).trim();
      req.authVia = 'bearer';
    } else {
      token = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
      if (token) req.authVia = 'cookie';
    }
    if (token) {
      const claims = verifySessionToken(token);
      if (claims) req.actor = (await actorForSession(claims)) ?? undefined;
    }
    next();
  } catch (err) {
    next(err);
  }
};
