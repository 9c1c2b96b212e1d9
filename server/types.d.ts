import type { Actor } from './services/auth/actor';

declare global {
  namespace Express {
    interface Request {
      /** Set by the auth middleware when a valid session token came with the request. */
      actor?: Actor;
    }
  }
}

export {};
