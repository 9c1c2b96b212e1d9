import crypto from 'node:crypto';
import jwt from 'jsonwebtoken';
import { config } from '../../config';

export const SESSION_COOKIE = 'tacklog_session';

interface TokenClaims {
  sub: string;
}

/**
 * The signing key as a KeyObject, made once at start. Given a string, jsonwebtoken first tries
 * to read it as a PEM public key (crypto.createPublicKey) on every verification; a secret
 * KeyObject skips that (it was ~7 % of the server's CPU under a scan load).
 */
const signingKey = crypto.createSecretKey(Buffer.from(config.jwtSecret, 'utf8'));

export function signSessionToken(userId: string): string {
  return jwt.sign({}, signingKey, { subject: userId, expiresIn: `${config.sessionHours}h`, algorithm: 'HS256' });
}

/** The user id in a valid token, or null for a bad or expired one. */
export function verifySessionToken(token: string): string | null {
  try {
    const claims = jwt.verify(token, signingKey, { algorithms: ['HS256'] }) as TokenClaims;
    return typeof claims.sub === 'string' ? claims.sub : null;
  } catch {
    // An invalid or expired token is treated like no token: the request is anonymous.
    return null;
  }
}
