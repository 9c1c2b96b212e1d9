import crypto from 'node:crypto';
import jwt from 'jsonwebtoken';
import { config } from '../../config';

export const SESSION_COOKIE = 'tacklog_session';

interface TokenClaims {
  sub?: unknown;
  jti?: unknown;
  exp?: unknown;
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

/**
 * Tokens already verified, with their claims and expiry: a station sends the same token with
 * every scan, and checking its signature again each time was ~10 % of the server's CPU under a
 * scan load. A token's text is what was verified, so an equal text needs no second check; its
 * expiry is still checked on every use. Bounded: the oldest entries go first.
 */
const verified = new Map<string, { claims: SessionClaims; expiresAtMs: number }>();
const VERIFIED_MAX = 5000;

/** The user and session in a valid token, or null for a bad or expired one (or one without a session). */
export function verifySessionToken(token: string): SessionClaims | null {
  const known = verified.get(token);
  if (known) {
    if (Date.now() < known.expiresAtMs) return known.claims;
    verified.delete(token);
    return null;
  }
  try {
    const claims = jwt.verify(token, signingKey, { algorithms: ['HS256'] }) as TokenClaims;
    if (typeof claims.sub !== 'string' || typeof claims.jti !== 'string') return null;
    const result = { userId: claims.sub, sessionId: claims.jti };
    if (typeof claims.exp === 'number') {
      if (verified.size >= VERIFIED_MAX) verified.delete(verified.keys().next().value as string);
      verified.set(token, { claims: result, expiresAtMs: claims.exp * 1000 });
    }
    return result;
  } catch {
    // An invalid or expired token is treated like no token: the request is anonymous.
    return null;
  }
}
