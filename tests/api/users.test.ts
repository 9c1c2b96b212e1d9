/**
 * Users and roles (admin) and each person's own account: create with a temporary password,
 * roles, deactivation, the last administrator, reset links by e-mail, the password policy,
 * one's own sessions. Every change is checked through the API as a person would meet it (a
 * token that stops working, a sign-in that does or does not work), then in the audit trail.
 */
import crypto from 'node:crypto';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, outgoingEmails, passwordResets, sessions, users } from '../../server/db/schema';
import { drainOutbox } from '../../server/services/mail/worker';
import { judgePassword } from '../../server/services/auth/password-policy';
import { api, login, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { capturedFor, startTestMail, type TestMail } from '../helpers/mail';
import { sfx } from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let mail: TestMail;
const as = (u: { token: string } | string) => api(app.baseUrl, typeof u === 'string' ? u : u.token);
const anon = () => api(app.baseUrl);

/** A password the policy accepts (four unrelated words and a number), different each call. */
const goodPassword = () => `copper-lantern-meadow-${crypto.randomInt(1000, 9999)}`;

beforeAll(async () => {
  app = await startApp();
  mail = await startTestMail();
  admin = await ensureUser(['admin']);
});
afterAll(async () => {
  await mail.close();
  await app.close();
});

async function createUser(body: Record<string, unknown>) {
  return as(admin).post('/api/users', { email: `person-${sfx()}@tacklog.test`, name: 'Wren Okafor', roles: ['receiving'], ...body });
}

async function auditFor(entityId: string) {
  return db.select().from(auditLog).where(eq(auditLog.entityId, entityId)).orderBy(auditLog.id);
}

describe('who may manage users', () => {
  it('answers 401 without a session and 403 to every role but admin, on every users route', async () => {
    const target = await ensureUser(['assembler']);
    const calls = [
      ['GET', '/api/users', undefined],
      ['POST', '/api/users', { email: 'x@tacklog.test', name: 'X', roles: ['quality'] }],
      ['PATCH', `/api/users/${target.id}`, { active: false }],
      ['POST', `/api/users/${target.id}/password-reset`, {}],
    ] as const;
    for (const [method, path, body] of calls) {
      expect((await anon().request(method, path, body)).status, `${method} ${path} anonymous`).toBe(401);
      for (const roles of [['receiving'], ['quality'], ['assembler'], ['purchasing'], []] as const) {
        const user = await ensureUser([...roles]);
        const res = await as(user).request<{ error: { code: string } }>(method, path, body);
        expect(res.status, `${method} ${path} as ${roles.join() || 'no role'}`).toBe(403);
        expect(res.body.error.code).toBe('FORBIDDEN');
      }
    }
    // Nothing changed: the target still signs in.
    expect((await as(target).get('/api/auth/me')).status).toBe(200);
  });
});

describe('creating a user', () => {
  it('without a password returns a strong temporary password once; it signs in, and only the password change answers until it is changed', async () => {
    const res = await createUser({ roles: ['quality', 'receiving'] });
    expect(res.status).toBe(201);
    const { user, temporaryPassword } = res.body;
    expect(user).toMatchObject({
      name: 'Wren Okafor',
      roles: ['quality', 'receiving'],
      active: true,
      mustChangePassword: true,
      openSessions: 0,
    });
    // Four-character groups from letters and digits that are not confused with each other, ≥ 16 characters.
    expect(temporaryPassword).toMatch(/^[a-km-zA-HJ-NP-Z2-9]{4}(-[a-km-zA-HJ-NP-Z2-9]{4}){3,}$/);
    expect((await judgePassword(temporaryPassword, { email: user.email })).ok).toBe(true);
    const other = await createUser({});
    expect(other.body.temporaryPassword).not.toBe(temporaryPassword);

    // Shown once: neither the list nor the stored row carries it.
    const list = await as(admin).get('/api/users');
    expect(JSON.stringify(list.body)).not.toContain(temporaryPassword);
    const [row] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.id, user.id));
    expect(row.hash).not.toContain(temporaryPassword);

    const signIn = await anon().post('/api/auth/login', { email: user.email, password: temporaryPassword });
    expect(signIn.status).toBe(200);
    expect(signIn.body.user.mustChangePassword).toBe(true);
    const token = signIn.body.token as string;
    expect((await as(token).get('/api/auth/me')).body.user.mustChangePassword).toBe(true);
    const refused = await as(token).get('/api/lots');
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('PASSWORD_CHANGE_REQUIRED');
    expect((await as(token).get('/api/auth/sessions')).status).toBe(200);

    const newPassword = goodPassword();
    const change = await as(token).post('/api/auth/password', { currentPassword: temporaryPassword, newPassword });
    expect(change.status).toBe(200);
    expect((await as(token).get('/api/lots')).status).toBe(200);
    expect((await as(token).get('/api/auth/me')).body.user.mustChangePassword).toBe(false);
    const listed = (await as(admin).get('/api/users')).body.items.find((u: { id: string }) => u.id === user.id);
    expect(listed).toMatchObject({ mustChangePassword: false, openSessions: 1 });
    expect(listed.lastSignInAt).not.toBeNull();

    const audit = await auditFor(user.id);
    expect(audit.map((a) => a.action)).toEqual(['user.create', 'login', 'user.password_change']);
    expect(audit[0].actorId).toBe(admin.id);
    expect(JSON.stringify(audit[0].after)).not.toContain(temporaryPassword);
  });

  it('with a password given, checks it against the policy (naming "password") and does not ask for a change', async () => {
    const short = await createUser({ password: 'too-short' });
    expect(short.status).toBe(400);
    expect(short.body.error.details).toEqual([{ field: 'password', message: expect.stringContaining('at least 12 characters') }]);
    const common = await createUser({ password: 'password1234' });
    expect(common.status).toBe(400);
    expect(common.body.error.details[0]).toMatchObject({ field: 'password', message: expect.stringContaining('common passwords') });

    const password = goodPassword();
    const res = await createUser({ password });
    expect(res.status).toBe(201);
    expect(res.body.temporaryPassword).toBeUndefined();
    expect(res.body.user.mustChangePassword).toBe(false);
    const token = await login(app.baseUrl, res.body.user.email, password);
    expect((await as(token).get('/api/lots')).status).toBe(200);
  });

  it('refuses bad input with 400 naming the field, and a second account with the same e-mail with 409', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ email: 'not-an-email' }, 'email'],
      [{ name: '  ' }, 'name'],
      [{ roles: [] }, 'roles'],
      [{ roles: ['foreman'] }, 'roles.0'],
      [{ password: 'x'.repeat(201) }, 'password'],
    ];
    for (const [body, field] of cases) {
      const res = await createUser(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.details.map((d: { field: string }) => d.field)).toContain(field);
    }
    const first = await createUser({});
    const again = await as(admin).post('/api/users', {
      email: first.body.user.email.toUpperCase(),
      name: 'Someone else',
      roles: ['quality'],
    });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('DUPLICATE_EMAIL');
  });
});

describe('changing a user', () => {
  it('a roles change takes effect with the next request of an existing session', async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const id = person.body.user.id;
    const session = await login(app.baseUrl, person.body.user.email, password);
    expect((await as(session).get('/api/stock')).status).toBe(403);
    const res = await as(admin).patch(`/api/users/${id}`, { roles: ['receiving', 'purchasing'] });
    expect(res.status).toBe(200);
    expect(res.body.user.roles).toEqual(['receiving', 'purchasing']);
    expect((await as(session).get('/api/stock')).status).toBe(200);
    expect((await as(session).get('/api/auth/me')).body.user.permissions).toContain('stock.read');
    await as(admin).patch(`/api/users/${id}`, { roles: ['receiving'] });
    expect((await as(session).get('/api/stock')).status).toBe(403);
    const audit = (await auditFor(id)).filter((a) => a.action === 'user.update');
    expect(audit[0].before).toMatchObject({ roles: 'Receiving' });
    expect(audit[0].after).toMatchObject({ roles: 'Receiving, Purchasing' });
  });

  it('deactivation ends the sessions at once; the old token stays ended after reactivation', async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const { id, email } = person.body.user;
    const t1 = await login(app.baseUrl, email, password);
    const t2 = await login(app.baseUrl, email, password);
    expect((await as(t1).get('/api/auth/me')).status).toBe(200);

    const off = await as(admin).patch(`/api/users/${id}`, { active: false });
    expect(off.status).toBe(200);
    expect(off.body.user).toMatchObject({ active: false, openSessions: 0 });
    expect((await as(t1).get('/api/auth/me')).status).toBe(401);
    expect((await as(t2).get('/api/lots')).status).toBe(401);
    const open = await db
      .select()
      .from(sessions)
      .where(and(eq(sessions.userId, id), sql`${sessions.revokedAt} IS NULL`));
    expect(open).toEqual([]);
    expect((await anon().post('/api/auth/login', { email, password })).status).toBe(401);

    const on = await as(admin).patch(`/api/users/${id}`, { active: true });
    expect(on.body.user.active).toBe(true);
    expect((await as(t1).get('/api/auth/me')).status).toBe(401);
    expect((await anon().post('/api/auth/login', { email, password })).status).toBe(200);

    const actions = (await auditFor(id)).map((a) => a.action);
    expect(actions).toContain('user.deactivate');
    expect(actions).toContain('user.reactivate');
    const deactivation = (await auditFor(id)).find((a) => a.action === 'user.deactivate')!;
    expect(deactivation.after).toMatchObject({ active: false, sessionsEnded: 2 });
  });

  it('an administrator cannot deactivate themselves (409 CANNOT_DEACTIVATE_SELF), and nothing changes', async () => {
    const self = await ensureUser(['admin'], { email: `admin-self-${sfx()}@tacklog.test` });
    const res = await as(self).patch(`/api/users/${self.id}`, { active: false, name: 'Changed name' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CANNOT_DEACTIVATE_SELF');
    expect((await as(self).get('/api/auth/me')).body.user.name).toBe(self.name);
  });

  it('the last active administrator cannot be removed; with a second one, the first may go', async () => {
    const only = await ensureUser(['admin', 'quality'], { email: `only-admin-${sfx()}@tacklog.test` });
    // Every other active administrator is set aside for this test and put back after it.
    const others = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.active, true), sql`'admin' = ANY(${users.roles})`, sql`${users.id} <> ${only.id}`));
    const otherIds = others.map((o) => o.id);
    if (otherIds.length) await db.update(users).set({ active: false }).where(inArray(users.id, otherIds));
    try {
      const res = await as(only).patch(`/api/users/${only.id}`, { roles: ['quality'] });
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('LAST_ADMIN');
      expect(res.body.error.details).toEqual([{ field: 'roles', message: 'would leave no active administrator' }]);
      const [row] = await db.select({ roles: users.roles }).from(users).where(eq(users.id, only.id));
      expect(row.roles).toEqual(['admin', 'quality']);

      const second = await ensureUser(['admin'], { email: `second-admin-${sfx()}@tacklog.test` });
      expect((await as(second).patch(`/api/users/${only.id}`, { active: false })).status).toBe(200);
      // Now `second` is the last one: removing its own role is refused, as is deactivating itself.
      const last = await as(second).patch(`/api/users/${second.id}`, { roles: ['purchasing'] });
      expect(last.body.error.code).toBe('LAST_ADMIN');
      await db.update(users).set({ active: false }).where(eq(users.id, second.id));
    } finally {
      if (otherIds.length) await db.update(users).set({ active: true }).where(inArray(users.id, otherIds));
    }
  });

  it('administrators removing themselves all at once leave exactly one (the check is made under a lock)', async () => {
    const others = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.active, true), sql`'admin' = ANY(${users.roles})`));
    const otherIds = others.map((o) => o.id);
    if (otherIds.length) await db.update(users).set({ active: false }).where(inArray(users.id, otherIds));
    try {
      const admins = await Promise.all([0, 1, 2].map((i) => ensureUser(['admin'], { email: `race-admin-${i}-${sfx()}@tacklog.test` })));
      // 30 requests: each of the three asks ten times to drop their own administrator role.
      const answers = await Promise.all(
        admins.flatMap((a) => Array.from({ length: 10 }, () => as(a).patch(`/api/users/${a.id}`, { roles: ['quality'] }))),
      );
      // Each answer: done, refused as the last administrator, or (once their role is gone) not allowed any more.
      const kinds = answers.map((r) => (r.status === 200 ? 'done' : `${r.status} ${r.body.error.code}`));
      expect(kinds.filter((k) => !['done', '409 LAST_ADMIN', '403 FORBIDDEN'].includes(k))).toEqual([]);
      expect(kinds).toContain('409 LAST_ADMIN');
      const left = await db
        .select({ id: users.id })
        .from(users)
        .where(and(eq(users.active, true), sql`'admin' = ANY(${users.roles})`));
      expect(left).toHaveLength(1);
      await db
        .update(users)
        .set({ active: false })
        .where(
          inArray(
            users.id,
            admins.map((a) => a.id),
          ),
        );
    } finally {
      if (otherIds.length) await db.update(users).set({ active: true }).where(inArray(users.id, otherIds));
    }
  });

  it('refuses an unknown user with 404 and an empty change with 400', async () => {
    expect((await as(admin).patch(`/api/users/${crypto.randomUUID()}`, { name: 'Nobody' })).status).toBe(404);
    const empty = await as(admin).patch(`/api/users/${admin.id}`, {});
    expect(empty.status).toBe(400);
    expect(empty.body.error.details[0].field).toBe('roles');
    expect((await as(admin).patch(`/api/users/${admin.id}`, { active: 'no' })).body.error.details[0].field).toBe('active');
  });
});

describe('password policy (create, change, reset)', () => {
  it('refuses a short or common new password naming newPassword; accepts a long unrelated one', async () => {
    const user = await ensureUser(['assembler'], { email: `policy-${sfx()}@tacklog.test`, password: 'wolfram-basalt-orchid' });
    const change = (newPassword: string) => as(user).post('/api/auth/password', { currentPassword: 'wolfram-basalt-orchid', newPassword });
    const short = await change('short-one');
    expect(short.status).toBe(400);
    expect(short.body.error.details).toEqual([{ field: 'newPassword', message: 'must be at least 12 characters (it has 9)' }]);
    // Found whole on the common-password list that @zxcvbn-ts/language-common ships (an outside list, not ours).
    const listed = await change('password1234');
    expect(listed.body.error.details[0]).toEqual({ field: 'newPassword', message: 'is on the list of common passwords; choose another' });
    // Built from common passwords, a keyboard row, a repeat, the program's name, the person's own e-mail.
    for (const weak of ['iloveyou1234', 'qwertyuiopasdf', 'aaaaaaaaaaaaaaa', 'Welcome12345!', 'Tacklog-2026', `${user.email}!`]) {
      const res = await change(weak);
      expect(res.status, weak).toBe(400);
      expect(res.body.error.details[0].field).toBe('newPassword');
    }
    expect((await change('tiny')).body.error.message).toMatch(/^newPassword must be at least 12 characters/);
    expect((await change(goodPassword())).status).toBe(200);
  });

  it('follows the minPasswordLength setting', async () => {
    await db.execute(
      sql`INSERT INTO settings (key, value) VALUES ('minPasswordLength', '20'::jsonb) ON CONFLICT (key) DO UPDATE SET value = EXCLUDED.value`,
    );
    try {
      const res = await createUser({ password: 'cobalt-heron-tundra' });
      expect(res.body.error.details[0]).toEqual({ field: 'password', message: 'must be at least 20 characters (it has 19)' });
      const temp = await createUser({});
      expect(temp.body.temporaryPassword.replace(/-/g, '').length).toBeGreaterThanOrEqual(20);
    } finally {
      await db.execute(sql`DELETE FROM settings WHERE key = 'minPasswordLength'`);
    }
  });
});

describe('own password and sessions', () => {
  it('a password change ends the other sessions but not this one', async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const email = person.body.user.email;
    const here = await login(app.baseUrl, email, password);
    const elsewhere = await login(app.baseUrl, email, password);
    const before = await as(here).get('/api/auth/sessions');
    expect(before.body.items).toHaveLength(2);
    expect(before.body.items.filter((s: { current: boolean }) => s.current)).toHaveLength(1);

    const res = await as(here).post('/api/auth/password', { currentPassword: password, newPassword: goodPassword() });
    expect(res.body).toEqual({ ok: true, endedSessions: 1 });
    expect((await as(here).get('/api/auth/me')).status).toBe(200);
    expect((await as(elsewhere).get('/api/auth/me')).status).toBe(401);
    const after = await as(here).get('/api/auth/sessions');
    expect(after.body.items).toEqual([expect.objectContaining({ current: true })]);
  });

  it("lists my sessions with when, from where and which is this one; ends one of mine, not someone else's", async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const email = person.body.user.email;
    const here = (await anon().post('/api/auth/login', { email, password }, { headers: { 'user-agent': 'Station tablet test' } })).body
      .token;
    const there = await login(app.baseUrl, email, password);
    const list = await as(here).get('/api/auth/sessions');
    expect(list.status).toBe(200);
    const mine = list.body.items.find((s: { current: boolean }) => s.current);
    expect(mine).toMatchObject({ userAgent: 'Station tablet test', ip: expect.stringContaining('127.0.0.1') });
    expect(Date.parse(mine.startedAt)).toBeGreaterThan(Date.now() - 60_000);
    const other = list.body.items.find((s: { current: boolean }) => !s.current);

    // Someone else's session id reads as not found and stays.
    const stranger = await ensureUser(['quality']);
    expect((await as(stranger).delete(`/api/auth/sessions/${other.id}`)).status).toBe(404);
    expect((await as(there).get('/api/auth/me')).status).toBe(200);

    const ended = await as(here).delete(`/api/auth/sessions/${other.id}`);
    expect(ended.body).toEqual({ ok: true, current: false });
    expect((await as(there).get('/api/auth/me')).status).toBe(401);
    expect((await as(here).delete(`/api/auth/sessions/${other.id}`)).status).toBe(404);
    expect((await as(here).delete('/api/auth/sessions/not-an-id')).status).toBe(400);

    const self = await as(here).delete(`/api/auth/sessions/${mine.id}`);
    expect(self.body).toEqual({ ok: true, current: true });
    expect((await as(here).get('/api/auth/me')).status).toBe(401);
    const actions = (await auditFor(person.body.user.id)).map((a) => a.action);
    expect(actions.filter((a) => a === 'session.end')).toHaveLength(2);
  });
});

describe('password reset by an e-mailed one-time link', () => {
  async function sendLink(userId: string) {
    const res = await as(admin).post(`/api/users/${userId}/password-reset`, {});
    expect(res.status).toBe(200);
    await drainOutbox();
    const [message] = await capturedFor(res.body.sentTo);
    const token = /reset-password\?token=([A-Za-z0-9_-]+)/.exec(message.text ?? '')?.[1];
    expect(token, 'the e-mail carries the link').toBeTruthy();
    return { sent: res.body, token: token!, message };
  }

  it('sends a link through the outbox that sets a new password once and ends every session', async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const { id, email } = person.body.user;
    const session = await login(app.baseUrl, email, password);

    const { sent, token, message } = await sendLink(id);
    expect(sent.sentTo).toBe(email);
    // Valid for the passwordResetHours setting (default 24 h).
    expect(Date.parse(sent.expiresAt) - Date.now()).toBeGreaterThan(23.9 * 3600_000);
    expect(Date.parse(sent.expiresAt) - Date.now()).toBeLessThanOrEqual(24 * 3600_000);
    expect(message.subject).toBe('[Tacklog] Set a new password');
    const [outbox] = await db.select().from(outgoingEmails).where(eq(outgoingEmails.recipientUserId, id));
    expect(outbox.kind).toBe('password_reset');
    // Stored hashed only: the row holds SHA-256 of the token, never the token.
    const rows = await db.select().from(passwordResets).where(eq(passwordResets.userId, id));
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(crypto.createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(await auditFor(id))).not.toContain(token);
    // Sending the link changes nothing yet.
    expect((await as(session).get('/api/auth/me')).status).toBe(200);
    // The Mailbox shows the link to its recipient only, not to an administrator reading all mail.
    const adminView = await as(admin).get(`/api/mail?to=${encodeURIComponent(email)}`);
    expect(adminView.body.items[0]).toMatchObject({ kind: 'password_reset', html: null });
    expect(JSON.stringify(adminView.body)).not.toContain(token);
    expect(JSON.stringify((await as(session).get('/api/mail')).body)).toContain(token);

    const weak = await anon().post('/api/auth/reset', { token, newPassword: 'password1234' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.details[0].field).toBe('newPassword');

    const newPassword = goodPassword();
    const used = await anon().post('/api/auth/reset', { token, newPassword });
    expect(used.status).toBe(200);
    expect((await as(session).get('/api/auth/me')).status).toBe(401);
    expect((await anon().post('/api/auth/login', { email, password })).status).toBe(401);
    expect((await anon().post('/api/auth/login', { email, password: newPassword })).status).toBe(200);

    const again = await anon().post('/api/auth/reset', { token, newPassword: goodPassword() });
    expect(again.status).toBe(400);
    expect(again.body.error).toMatchObject({ code: 'RESET_LINK_INVALID', details: [{ field: 'token', message: 'was already used' }] });
    const actions = (await auditFor(id)).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(['user.password_reset_sent', 'user.password_reset']));
  });

  it('an expired link, an unknown one and a deactivated account are refused, and nothing changes', async () => {
    const password = goodPassword();
    const person = await createUser({ password });
    const { id, email } = person.body.user;
    const { token } = await sendLink(id);
    await db
      .update(passwordResets)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(passwordResets.userId, id));
    const expired = await anon().post('/api/auth/reset', { token, newPassword: goodPassword() });
    expect(expired.status).toBe(400);
    expect(expired.body.error.details).toEqual([{ field: 'token', message: 'has expired' }]);
    expect(expired.body.error.message).toMatch(/expired at \d{4}-\d{2}-\d{2}/);
    expect((await anon().post('/api/auth/login', { email, password })).status).toBe(200);

    const unknown = await anon().post('/api/auth/reset', {
      token: crypto.randomBytes(32).toString('base64url'),
      newPassword: goodPassword(),
    });
    expect(unknown.body.error).toMatchObject({
      code: 'RESET_LINK_INVALID',
      details: [{ field: 'token', message: 'is not a known reset link' }],
    });
    expect((await anon().post('/api/auth/reset', { newPassword: goodPassword() })).body.error.details[0].field).toBe('token');

    const fresh = await sendLink(id);
    await as(admin).patch(`/api/users/${id}`, { active: false });
    const off = await anon().post('/api/auth/reset', { token: fresh.token, newPassword: goodPassword() });
    expect(off.body.error.details).toEqual([{ field: 'token', message: 'belongs to a deactivated account' }]);
    const refused = await as(admin).post(`/api/users/${id}/password-reset`, {});
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('USER_DEACTIVATED');
  });
});
