/**
 * Database unreachable → 503 DB_UNAVAILABLE with Retry-After, for every kind of request (even
 * /api/health, even with a session), never a 500. The app here is built from freshly imported
 * modules whose DATABASE_URL names a port where nothing listens. Stopping and restarting a real
 * PostgreSQL under load is in tests/fault/.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { errorBodySchema } from '../../shared/schemas/common';
import { api, listen, type TestApp } from '../helpers/api';
import { freePort } from '../../scripts/pg';

let app: TestApp;
let closeDb: () => Promise<void>;
let token: string;
const previousUrl = process.env.DATABASE_URL;

beforeAll(async () => {
  const port = await freePort(); // free now: nothing listens there
  process.env.DATABASE_URL = `postgres://tacklog@127.0.0.1:${port}/gone`;
  vi.resetModules();
  const fresh = await import('../../server/app');
  const freshDb = await import('../../server/db/client');
  const tokens = await import('../../server/services/auth/tokens');
  closeDb = freshDb.closeDb;
  token = tokens.signSessionToken('00000000-0000-4000-8000-000000000001', '00000000-0000-4000-8000-000000000002');
  app = await listen(fresh.createApp());
  if (previousUrl === undefined) delete process.env.DATABASE_URL;
  else process.env.DATABASE_URL = previousUrl;
});

afterAll(async () => {
  await app?.close();
  await closeDb?.();
});

function expect503(res: { status: number; body: unknown; headers: Headers }, what: string): void {
  expect(res.status, what).toBe(503);
  expect(errorBodySchema.parse(res.body).error.code, what).toBe('DB_UNAVAILABLE');
  // RFC 9110 §10.2.3: Retry-After as delay-seconds.
  expect(res.headers.get('retry-after'), what).toMatch(/^\d+$/);
  expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
}

describe('database unreachable', () => {
  it('GET /api/health answers 503 DB_UNAVAILABLE with Retry-After, with and without a session', async () => {
    expect503(await api(app.baseUrl).get('/api/health'), 'health, no session');
    expect503(await api(app.baseUrl, token).get('/api/health'), 'health, bearer token');
    expect503(await api(app.baseUrl).get('/api/health', { headers: { cookie: `tacklog_session=${token}` } }), 'health, cookie');
  });

  it('sign-in, reads and writes answer 503, not 500', async () => {
    expect503(await api(app.baseUrl).post('/api/auth/login', { email: 'admin@tacklog.test', password: 'x' }), 'login');
    expect503(await api(app.baseUrl, token).get('/api/auth/me'), 'me');
    expect503(await api(app.baseUrl, token).get('/api/lots'), 'lots');
    expect503(await api(app.baseUrl, token).post('/api/scans/resolve', { code: 'TLC-NOTHING' }), 'scan');
    expect503(
      await api(app.baseUrl, token).post('/api/suppliers', { name: 'Some supplier' }, { headers: { 'idempotency-key': 'k-1' } }),
      'write with a key',
    );
  });

  it('still refuses what it can refuse without the database: no session → 401, malformed JSON → 400', async () => {
    expect((await api(app.baseUrl).get('/api/lots')).status).toBe(401);
    expect((await api(app.baseUrl).post('/api/auth/login', undefined, { raw: '{"broken' })).status).toBe(400);
  });
});
