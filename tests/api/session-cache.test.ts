/**
 * The session cache (server/services/auth/session-cache.ts) with its LISTEN connection running,
 * as in the server: a remembered session must stop working when it is revoked or its user is
 * disabled — in this process at once, and from another connection (an admin's SQL, another
 * worker) as soon as PostgreSQL delivers the notification — and nothing is remembered while
 * the listening connection is down.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import pg from 'pg';
import { db } from '../../server/db/client';
import { sessions, users } from '../../server/db/schema';
import { cachedActor, sessionCacheActive, startSessionCache, stopSessionCache } from '../../server/services/auth/session-cache';
import { verifySessionToken } from '../../server/services/auth/tokens';
import { api, login, startApp, type TestApp } from '../helpers/api';
import { ensureUser, TEST_PASSWORD, testDatabaseUrl } from '../helpers/db';

let app: TestApp;
/** Another connection, like an administrator's psql or another server process. */
let other: pg.Client;

beforeAll(async () => {
  app = await startApp();
  other = new pg.Client({ connectionString: testDatabaseUrl() });
  await other.connect();
});

afterAll(async () => {
  await stopSessionCache();
  await other?.end();
  await app?.close();
});

afterEach(async () => {
  await stopSessionCache();
});

const claimsOf = (token: string) => verifySessionToken(token)!;

/** Waits (polling) until the cache no longer holds the session: the notification arrived. */
async function untilForgotten(token: string): Promise<void> {
  const { sessionId, userId } = claimsOf(token);
  for (let i = 0; i < 500 && cachedActor(sessionId, userId); i++) await new Promise((r) => setTimeout(r, 10));
}

async function rememberedSession(roles: Parameters<typeof ensureUser>[0] = ['assembler']) {
  const user = await ensureUser(roles, { email: `cache-${crypto.randomUUID()}@tacklog.test` });
  const token = await login(app.baseUrl, user.email, TEST_PASSWORD);
  expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(200);
  const { sessionId, userId } = claimsOf(token);
  expect(cachedActor(sessionId, userId)?.email).toBe(user.email);
  return { user, token };
}

describe('session cache', () => {
  it('remembers a signed-in session once it is listening', async () => {
    await startSessionCache();
    expect(sessionCacheActive()).toBe(true);
    await rememberedSession();
  });

  it('ends a remembered session at once on logout in this process', async () => {
    await startSessionCache();
    const { token } = await rememberedSession();
    expect((await api(app.baseUrl, token).post('/api/auth/logout', {})).status).toBe(200);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(401);
  });

  it('ends the other remembered sessions at once on a password change, keeping this one', async () => {
    await startSessionCache();
    const { user, token } = await rememberedSession();
    const second = await login(app.baseUrl, user.email, TEST_PASSWORD);
    expect((await api(app.baseUrl, second).get('/api/auth/me')).status).toBe(200);
    const changed = await api(app.baseUrl, token).post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'a-new-longer-password-7',
    });
    expect(changed.status).toBe(200);
    expect((await api(app.baseUrl, second).get('/api/auth/me')).status).toBe(401);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(200);
  });

  it('forgets a session revoked from another connection when the notification arrives', async () => {
    await startSessionCache();
    const { token } = await rememberedSession();
    await other.query('UPDATE sessions SET revoked_at = now() WHERE id = $1', [claimsOf(token).sessionId]);
    await untilForgotten(token);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(401);
  });

  it('forgets every session of a user disabled or given other roles from another connection', async () => {
    await startSessionCache();
    const { user, token } = await rememberedSession(['quality']);
    await other.query(`UPDATE users SET roles = '{assembler}' WHERE id = $1`, [user.id]);
    await untilForgotten(token);
    const me = await api(app.baseUrl, token).get('/api/auth/me');
    expect(me.body.user.roles).toEqual(['assembler']);

    await other.query('UPDATE users SET active = false WHERE id = $1', [user.id]);
    await untilForgotten(token);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(401);
  });

  it("ends a remembered user's sessions at once when an administrator deactivates them, and applies new roles at once", async () => {
    await startSessionCache();
    const admin = await ensureUser(['admin'], { email: `cache-admin-${crypto.randomUUID()}@tacklog.test` });
    const { user, token } = await rememberedSession(['quality']);
    const roles = await api(app.baseUrl, admin.token).patch(`/api/users/${user.id}`, { roles: ['receiving'] });
    expect(roles.status).toBe(200);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).body.user.roles).toEqual(['receiving']);
    const off = await api(app.baseUrl, admin.token).patch(`/api/users/${user.id}`, { active: false });
    expect(off.status).toBe(200);
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(401);
  });

  it('remembers nothing while not listening: a revocation counts on the next request', async () => {
    await startSessionCache();
    const { token } = await rememberedSession();
    await stopSessionCache();
    expect(sessionCacheActive()).toBe(false);
    await db
      .update(sessions)
      .set({ revokedAt: sql`now()` })
      .where(eq(sessions.id, claimsOf(token).sessionId));
    expect((await api(app.baseUrl, token).get('/api/auth/me')).status).toBe(401);
  });

  it('leaves a session alone when an unrelated user changes', async () => {
    await startSessionCache();
    const { token } = await rememberedSession();
    const bystander = await ensureUser(['receiving'], { email: `cache-bystander-${crypto.randomUUID()}@tacklog.test` });
    await db.update(users).set({ name: 'Renamed Bystander' }).where(eq(users.id, bystander.id));
    await other.query('SELECT 1'); // a round trip, so the notification about the bystander has been sent
    await new Promise((r) => setTimeout(r, 50));
    const { sessionId, userId } = claimsOf(token);
    expect(cachedActor(sessionId, userId)).toBeDefined();
  });
});
