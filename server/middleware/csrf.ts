/**
 * Guards against cross-site request forgery and form posts (a page elsewhere — even on another
 * port of the same host — submitting to the API with the signed-in cookie):
 *
 *  - `sameOriginOnly`: a state-changing request that does not carry a bearer token (so the
 *    browser's cookie may sign it) is refused with 403 CROSS_SITE_REQUEST when the browser says
 *    it came from elsewhere: `Sec-Fetch-Site` other than same-origin/none, or an `Origin` that is
 *    not the app's own (nor one in TACKLOG_ALLOWED_ORIGINS). Scripts with a bearer token and
 *    clients that send neither header are not affected.
 *  - `jsonBodiesOnly`: a state-changing request with a body must send application/json (HTML
 *    forms cannot), or multipart/form-data, which only upload routes accept (see endpoint()).
 *    Anything else is 415 UNSUPPORTED_MEDIA_TYPE. A body-less POST needs no Content-Type.
 */
import type { Request, RequestHandler } from 'express';
import { config } from '../config';
import { AppError } from '../errors';

export const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** The request carries a body (Content-Length above 0 or a chunked body), as type-is decides it. */
export function hasBody(req: Request): boolean {
  if (req.headers['transfer-encoding'] !== undefined) return true;
  const length = req.headers['content-length'];
  return length !== undefined && length !== '0';
}

function hasBearer(req: Request): boolean {
  return req.get('authorization')?.toLowerCase().startsWith('bearer ') ?? false;
}

/** scheme://host[:port] of the app as this request reached it. */
function ownOrigin(req: Request): string {
  return `${req.protocol}://${req.get('host') ?? ''}`.toLowerCase();
}

function crossSite(detail: string): AppError {
  return new AppError(
    'CROSS_SITE_REQUEST',
    'This change was sent from a page outside Tacklog and was refused. Open Tacklog itself and try again.',
    403,
    [{ field: detail, message: 'is not this application' }],
  );
}

export const sameOriginOnly: RequestHandler = (req, _res, next) => {
  if (!STATE_CHANGING.has(req.method) || hasBearer(req)) {
    next();
    return;
  }
  const site = req.get('sec-fetch-site')?.toLowerCase();
  if (site !== undefined && site !== 'same-origin' && site !== 'none') {
    next(crossSite('Sec-Fetch-Site'));
    return;
  }
  const origin = req.get('origin')?.toLowerCase().replace(/\/$/, '');
  // "null" is what browsers send from sandboxed frames, file: pages and some redirects.
  if (origin !== undefined && origin !== ownOrigin(req) && !config.allowedOrigins.some((o) => o.toLowerCase() === origin)) {
    next(crossSite('Origin'));
    return;
  }
  next();
};

export const jsonBodiesOnly: RequestHandler = (req, _res, next) => {
  if (!STATE_CHANGING.has(req.method) || !hasBody(req) || req.is('application/json') || req.is('multipart/form-data')) {
    next();
    return;
  }
  next(unsupportedMediaType(req.get('content-type')));
};

export function unsupportedMediaType(sent: string | undefined): AppError {
  return new AppError(
    'UNSUPPORTED_MEDIA_TYPE',
    `Send the request body as application/json${sent ? ` (it came as ${sent.split(';')[0]})` : ' (it came without a Content-Type)'}.`,
    415,
    [{ field: 'Content-Type', message: 'must be application/json' }],
  );
}
