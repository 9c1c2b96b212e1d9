/**
 * The security headers of every answer (helmet), worked out once at start.
 *
 * With Tacklog's options none of helmet's headers depends on the request: the same twelve go on
 * every answer. Helmet still sets them through a chain of twelve middleware functions and builds
 * the Content-Security-Policy text again for each request — about a twentieth of a scan
 * lookup's server time. `fixedHeaders` runs the middleware once on a recording response and then
 * gives each answer the recorded headers. A directive that must change per request (a nonce, a
 * function of the request) cannot be recorded: `fixedHeaders` refuses a middleware that reads the
 * request or does not finish at once, and tests/unit/security-headers.test.ts compares the
 * headers with helmet's own on a real request.
 */
import type { Request, RequestHandler, Response } from 'express';
import type { HelmetOptions } from 'helmet';

export const helmetOptions: Readonly<HelmetOptions> = {
  contentSecurityPolicy: {
    useDefaults: true,
    directives: {
      // Everything is bundled: no source outside this origin.
      'default-src': ["'self'"],
      'img-src': ["'self'", 'data:', 'blob:'],
      'media-src': ["'self'", 'data:', 'blob:'],
      'style-src': ["'self'", "'unsafe-inline'"],
      'script-src': ["'self'"],
      'connect-src': ["'self'"],
      'upgrade-insecure-requests': null,
    },
  },
  crossOriginEmbedderPolicy: false,
};

type HeaderValue = string | number | readonly string[];

/** `middleware`'s headers, recorded once and set on every answer. */
export function fixedHeaders(middleware: RequestHandler): RequestHandler {
  const headers = new Map<string, HeaderValue>();
  const removed = new Set<string>();
  const recorder = {
    setHeader(name: string, value: HeaderValue) {
      headers.set(name, value);
      removed.delete(name.toLowerCase());
      return recorder;
    },
    getHeader: (name: string) => headers.get(name),
    removeHeader(name: string) {
      headers.delete(name);
      removed.add(name.toLowerCase());
    },
  };
  // A request that throws on any read: a middleware whose headers depend on it is refused.
  const request = new Proxy(
    {},
    {
      get(_target, property) {
        throw new Error(`fixedHeaders: the middleware read the request (${String(property)}); its headers cannot be fixed`);
      },
    },
  );
  let finished = false;
  middleware(request as Request, recorder as unknown as Response, (err?: unknown) => {
    if (err) throw err instanceof Error ? err : new Error(String(err));
    finished = true;
  });
  if (!finished) throw new Error('fixedHeaders: the middleware did not finish at once; its headers cannot be fixed');
  const toSet = [...headers];
  const toRemove = [...removed];
  return (_req, res, next) => {
    for (const [name, value] of toSet) res.setHeader(name, value);
    for (const name of toRemove) res.removeHeader(name);
    next();
  };
}
