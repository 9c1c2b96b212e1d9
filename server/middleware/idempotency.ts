/**
 * Idempotency-Key for state-changing requests (api.md): the first response to a key is stored
 * per signed-in actor; a repeat gets that response again without the handler running.
 *
 *  - The key row is inserted before the handler runs (INSERT … ON CONFLICT DO NOTHING), so two
 *    concurrent requests with one key cannot both run: the second gets 409 IDEMPOTENCY_IN_PROGRESS.
 *  - The same key with another method, path, query or JSON body is 422 IDEMPOTENCY_KEY_REUSED
 *    (the body is compared by a SHA-256 of its canonical JSON, so key order does not matter).
 *  - Responses of 500 and above are not kept (the row is deleted) so a retry can run.
 *  - A key whose first request never answered (the process died) is taken over after a while.
 *  - Keys are kept for a week.
 */
import crypto from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { logger } from '../logger';
import { AppError } from '../errors';
import { isDatabaseUnavailable } from '../db/availability';
import { claimKey, pruneKeys, releaseKey, storeResponse, type StoredRequest } from '../services/idempotency';

const METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/** Keys are kept this long (a client retries within minutes, not days). */
const KEEP_MS = 7 * 24 * 3600 * 1000;
let lastPrune = 0;

/** Drops keys past their keeping time, at most once an hour per process. */
function pruneNowAndThen(): void {
  const now = Date.now();
  if (now - lastPrune < 3600 * 1000) return;
  lastPrune = now;
  pruneKeys(new Date(now - KEEP_MS)).then(
    () => undefined,
    (err: unknown) => logger.error({ err }, 'pruning old idempotency keys failed'),
  );
}

/** JSON with object keys sorted, so {a,b} and {b,a} are one request. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.keys(value as Record<string, unknown>)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`);
    return `{${entries.join(',')}}`;
  }
  return JSON.stringify(value) ?? 'null';
}

/**
 * What identifies the request beside method and path: its query and JSON body. A multipart
 * upload is not read yet at this point, so it has no hash (method and path still must match).
 */
function requestHash(req: Request): string | null {
  if (req.is('multipart/form-data')) return null;
  const body: unknown =
    req.body === undefined ||
    (typeof req.body === 'object' && req.body !== null && !Array.isArray(req.body) && Object.keys(req.body as object).length === 0)
      ? null
      : req.body;
  return crypto
    .createHash('sha256')
    .update(canonical({ query: req.query, body }))
    .digest('hex');
}

function invalidKey(): AppError {
  return new AppError('VALIDATION_FAILED', 'The Idempotency-Key header must be 1 to 200 characters.', 400, [
    { field: 'Idempotency-Key', message: 'must be 1 to 200 characters' },
  ]);
}

/**
 * The database went away during a request (503): its key could not be released then. Release it
 * once the database is back, so the client's retry with the same key runs instead of waiting for
 * the key to go stale. Tries every 5 s for up to 5 minutes (then the stale-key takeover applies).
 */
function releaseWhenBack(actorId: string, key: string, attempt = 1): void {
  setTimeout(() => {
    releaseKey(actorId, key).then(
      () => undefined,
      () => {
        if (attempt < 60) releaseWhenBack(actorId, key, attempt + 1);
      },
    );
  }, 5000).unref();
}

/**
 * A request whose handler claims its key in its own first statement, and may store its answer
 * with its writes (one round trip each fewer): see CLAIMED_BY_HANDLER. `claimed` and `stored`
 * say what the handler did; whatever it did not, the middleware does as for any other request.
 */
export interface HandlerClaimedKey {
  actorId: string;
  key: string;
  method: string;
  path: string;
  requestHash: string | null;
  claimed: boolean;
  stored: boolean;
}

/**
 * The routes that claim their key themselves: the station load, sent with every container a
 * station scans. A request refused before its claim (access, input) is not kept: a repeat is
 * checked again and gets the same answer.
 */
const CLAIMED_BY_HANDLER = /^\/api\/stations\/[^/]+\/load$/;

/** Holds back the end of the response until its status and body are stored (or the key released). */
function captureResponse(res: Response, actorId: string, key: string, byHandler?: HandlerClaimedKey): void {
  let body: unknown = null;
  const json = res.json.bind(res);
  res.json = (value: unknown) => {
    body = value;
    return json(value);
  };
  const end = res.end.bind(res) as (...args: unknown[]) => Response;
  let stored = false;
  res.end = ((...args: unknown[]) => {
    if (stored) return end(...args);
    stored = true;
    // Not claimed (refused before the handler's claim, or a repeat answered), or already stored.
    if (byHandler && (!byHandler.claimed || byHandler.stored)) return end(...args);
    const save = res.statusCode >= 500 ? releaseKey(actorId, key) : storeResponse(actorId, key, res.statusCode, body);
    save.then(
      () => end(...args),
      (err: unknown) => {
        if (res.statusCode >= 500 && isDatabaseUnavailable(err)) releaseWhenBack(actorId, key);
        else (res.req?.log ?? logger).error({ err }, 'could not store the idempotent response');
        end(...args);
      },
    );
    return res;
  }) as Response['end'];
}

export const idempotency: RequestHandler = async (req, res, next) => {
  try {
    const key = req.get('idempotency-key');
    if (key === undefined || !METHODS.has(req.method) || !req.actor) {
      next();
      return;
    }
    if (key.length < 1 || key.length > 200) throw invalidKey();
    const actorId = req.actor.id;
    const path = req.originalUrl.split('?')[0];
    const hash = requestHash(req);
    if (req.method === 'POST' && CLAIMED_BY_HANDLER.test(path)) {
      req.idempotency = { actorId, key, method: req.method, path, requestHash: hash, claimed: false, stored: false };
      pruneNowAndThen();
      captureResponse(res, actorId, key, req.idempotency);
      next();
      return;
    }
    const claim = await claimKey(actorId, key, req.method, path, hash);
    if (claim.claimed) {
      pruneNowAndThen();
      captureResponse(res, actorId, key);
      next();
      return;
    }
    answerRepeat(req, res, claim.first, path, hash);
  } catch (err) {
    next(err);
  }
};

/** What a handler that claims its own key answers when its claim found the key taken. */
export const KEY_TAKEN = Symbol('the Idempotency-Key was taken');

/**
 * Runs a handler of a CLAIMED_BY_HANDLER route. When its claim found the key taken, the key is
 * claimed the usual way now: a key whose first request died is taken over and the handler runs
 * after all; otherwise the repeat is answered here (the first answer again, or why not as an
 * error: 409, 422) and this resolves to undefined, the response already sent.
 */
export async function runClaimingItself<T>(req: Request, res: Response, run: () => Promise<T | typeof KEY_TAKEN>): Promise<T | undefined> {
  const first = await run();
  if (first !== KEY_TAKEN) return first;
  const k = req.idempotency!;
  const claim = await claimKey(k.actorId, k.key, k.method, k.path, k.requestHash);
  if (!claim.claimed) {
    answerRepeat(req, res, claim.first, k.path, k.requestHash);
    return undefined;
  }
  k.claimed = true;
  const again = await run();
  if (again === KEY_TAKEN)
    throw new AppError('IDEMPOTENCY_IN_PROGRESS', 'A request with this Idempotency-Key is running; send it again.', 409);
  return again;
}

/** A repeat of a key already used: its first answer again, or an error saying why not. */
function answerRepeat(req: Request, res: Response, first: StoredRequest | null, path: string, hash: string | null): void {
  if (!first) throw new AppError('IDEMPOTENCY_IN_PROGRESS', 'A request with this Idempotency-Key was just released; send it again.', 409);
  if (first.method !== req.method || first.path !== path) {
    throw new AppError(
      'IDEMPOTENCY_KEY_REUSED',
      `This Idempotency-Key was already used for ${first.method} ${first.path}; use a new key for a different request.`,
      422,
    );
  }
  if (first.requestHash !== null && first.requestHash !== hash) {
    throw new AppError(
      'IDEMPOTENCY_KEY_REUSED',
      'This Idempotency-Key was already used for a request with a different body; use a new key for a different request.',
      422,
      [{ field: 'Idempotency-Key', message: 'was used with a different body' }],
    );
  }
  if (first.statusCode === null) {
    throw new AppError(
      'IDEMPOTENCY_IN_PROGRESS',
      'The first request with this Idempotency-Key is still running; wait for it and retry.',
      409,
    );
  }
  res.set('Idempotent-Replayed', 'true');
  if (first.responseBody === null) res.status(first.statusCode).end();
  else res.status(first.statusCode).json(first.responseBody);
}
