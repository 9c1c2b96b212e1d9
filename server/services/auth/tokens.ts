import crypto from 'node:crypto';
import jwt from 'jsonwebtoken';
import { config } from '../../config';

export const SESSION_COOKIE = 'tacklog_session';

interface TokenClaims {
  sub?: unknown;
  jti?: unknown;
}

/**
 * The signing key as a KeyObject, made once at start. Given a string, jsonwebtoken first tries
 * to read it as a PEM public key (crypto.createPublicKey) on every verification; a secret
 * KeyObject skips that (it was ~7 % of the server's CPU under a scan load).
 */
const signingKey = crypto.createSecretKey(Buffer.from(config.jwtSecret, 'utf8'));

export interface SessionClaims {
  userId: string;
  /** The sessions row this token belongs to. */
  sessionId: string;
}

/** A signed token naming the user and the session row (checked on every request). */
export function signSessionToken(userId: string, sessionId: string): string {
  return jwt.sign({}, signingKey, {
    subject: userId,
    jwtid: sessionId,
    expiresIn: `${config.sessionHours}h`,
    algorithm: 'HS256',
  });
}

/** The user and session in a valid token, or null for a bad or expired one (or one without a session). */
export function verifySessionToken(token: string): SessionClaims | null {
  try {
    const claims = jwt.verify(token, signingKey, { algorithms: ['HS256'] }) as TokenClaims;
    if (typeof claims.sub !== 'string' || typeof claims.jti !== 'string') return null;
    return { userId: claims.sub, sessionId: claims.jti };
  } catch {
    // An invalid or expired token is treated like no token: the request is anonymous.
    return null;
  }
}
