import jwt from 'jsonwebtoken';
import { config } from '../../config';

export const SESSION_COOKIE = 'tacklog_session';

interface TokenClaims {
  sub?: unknown;
  jti?: unknown;
}

export interface SessionClaims {
  userId: string;
  /** The sessions row this token belongs to. */
  sessionId: string;
}

/** A signed token naming the user and the session row (checked on every request). */
export function signSessionToken(userId: string, sessionId: string): string {
  return jwt.sign({}, config.jwtSecret, {
    subject: userId,
    jwtid: sessionId,
    expiresIn: `${config.sessionHours}h`,
    algorithm: 'HS256',
  });
}

/** The user and session in a valid token, or null for a bad or expired one (or one without a session). */
export function verifySessionToken(token: string): SessionClaims | null {
  try {
    const claims = jwt.verify(token, config.jwtSecret, { algorithms: ['HS256'] }) as TokenClaims;
    if (typeof claims.sub !== 'string' || typeof claims.jti !== 'string') return null;
    return { userId: claims.sub, sessionId: claims.jti };
  } catch {
    // An invalid or expired token is treated like no token: the request is anonymous.
    return null;
  }
}
