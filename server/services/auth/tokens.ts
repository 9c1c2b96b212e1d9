import jwt from 'jsonwebtoken';
import { config } from '../../config';

export const SESSION_COOKIE = 'tacklog_session';

interface TokenClaims {
  sub: string;
}

export function signSessionToken(userId: string): string {
  return jwt.sign({}, config.jwtSecret, { subject: userId, expiresIn: `${config.sessionHours}h`, algorithm: 'HS256' });
}

/** The user id in a valid token, or null for a bad or expired one. */
export function verifySessionToken(token: string): string | null {
  try {
    const claims = jwt.verify(token, config.jwtSecret, { algorithms: ['HS256'] }) as TokenClaims;
    return typeof claims.sub === 'string' ? claims.sub : null;
  } catch {
    // An invalid or expired token is treated like no token: the request is anonymous.
    return null;
  }
}
