import type { Logger } from 'pino';
import type { Actor } from './services/auth/actor';
import type { HandlerClaimedKey } from './middleware/idempotency';

declare global {
  namespace Express {
    interface Request {
      /** Set by the auth middleware when a valid session token came with the request. */
      actor?: Actor;
      /** How the session token came: a bearer header (scripts) or the browser's cookie. */
      authVia?: 'bearer' | 'cookie';
      /** Set by acceptUpload: this route reads a multipart upload. */
      uploadRead?: boolean;
      /** The request id (the caller's X-Request-Id when sane, else a new UUID), set by requestLogger. */
      id: string;
      /** A logger carrying the request (id, method, URL), set by requestLogger. */
      log: Logger;
      /** An Idempotency-Key this request's handler claims itself (the idempotency middleware). */
      idempotency?: HandlerClaimedKey;
    }
  }
}

export {};
