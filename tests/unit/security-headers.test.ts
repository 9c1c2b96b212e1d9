import type { AddressInfo } from 'node:net';
import express, { type RequestHandler } from 'express';
import helmet from 'helmet';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fixedHeaders, helmetOptions } from '../../server/middleware/security-headers';

// The security headers recorded once must be exactly helmet's own, on every kind of answer.
const servers: ReturnType<express.Express['listen']>[] = [];
async function serve(headers: RequestHandler): Promise<string> {
  const app = express();
  app.use(headers);
  app.get('/json', (_req, res) => res.json({ ok: true }));
  app.post('/text', (_req, res) => res.status(201).type('text/plain').send('made'));
  app.use((_req, res) => res.status(404).json({ error: 'no' }));
  const server = await new Promise<ReturnType<express.Express['listen']>>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  servers.push(server);
  return `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}
afterAll(() => Promise.all(servers.map((s) => new Promise((r) => s.close(r)))));

const securityHeaders = (res: Response) =>
  Object.fromEntries(
    [...res.headers].filter(([name]) => !['date', 'content-length', 'content-type', 'connection', 'keep-alive', 'etag'].includes(name)),
  );

let live = '';
let fixed = '';
beforeAll(async () => {
  live = await serve(helmet(helmetOptions));
  fixed = await serve(fixedHeaders(helmet(helmetOptions)));
});

describe('fixed security headers', () => {
  it.each([
    ['GET', '/json'],
    ['POST', '/text'],
    ['GET', '/nothing-here'],
  ])('%s %s carries exactly the headers helmet sets itself', async (method, path) => {
    const [a, b] = await Promise.all([fetch(`${live}${path}`, { method }), fetch(`${fixed}${path}`, { method })]);
    expect(b.status).toBe(a.status);
    const want = securityHeaders(a);
    // OWASP Secure Headers Project: a restrictive policy and nosniff are among them.
    expect(want['content-security-policy']).toContain("default-src 'self'");
    expect(want['x-content-type-options']).toBe('nosniff');
    expect(Object.keys(want).length).toBeGreaterThanOrEqual(10);
    expect(securityHeaders(b)).toEqual(want);
  });

  it('refuses a middleware whose headers depend on the request', () => {
    const perRequest: RequestHandler = (req, res, next) => {
      res.setHeader('X-Seen-Path', req.path);
      next();
    };
    expect(() => fixedHeaders(perRequest)).toThrow(/read the request/);
  });

  it('refuses a middleware that does not finish at once', () => {
    const later: RequestHandler = (_req, res, next) => {
      setTimeout(() => {
        res.setHeader('X-Later', '1');
        next();
      }, 0);
    };
    expect(() => fixedHeaders(later)).toThrow(/did not finish at once/);
  });

  it('refuses a nonce made per request by a directive function', () => {
    const withNonce = helmet({
      contentSecurityPolicy: { directives: { 'script-src': ["'self'", (req) => `'nonce-${String((req as { nonce?: string }).nonce)}'`] } },
    });
    expect(() => fixedHeaders(withNonce)).toThrow(/read the request/);
  });
});
