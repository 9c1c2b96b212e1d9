/**
 * Who hears of what: notification settings (own and, for an administrator, anyone's; audited),
 * alert e-mails to exactly the subscribers of a new alert (once, even with two sweeps racing),
 * e-mail on resolving only for those who asked, the daily digest once per user and plant day
 * (twice triggered, and from two processes), and the Mailbox API. The local catcher runs for
 * the whole file.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, like } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { alerts, auditLog, outgoingEmails } from '../../server/db/schema';
import { config } from '../../server/config';
import { sweep } from '../../server/services/compliance';
import { drainOutbox } from '../../server/services/mail/worker';
import { queueAlertMails } from '../../server/services/notifications/alert-mail';
import { plantDateOf, queueDigests } from '../../server/services/notifications/digest';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createLot, createModel, createStation, createStationLoad, createTwoPart, minutesAgo, sfx } from '../helpers/fixtures';
import { capturedFor, runMailChild, startTestMail, type TestMail } from '../helpers/mail';

let app: TestApp;
let mail: TestMail;
const run = sfx().toLowerCase();
const person = (roles: Parameters<typeof ensureUser>[0], label: string) =>
  ensureUser(roles, { email: `mail-${label}-${run}@tacklog.test`, name: `Mail ${label} ${run}` });

let admin: TestUser,
  qAtOnce: TestUser,
  qNone: TestUser,
  qDigest: TestUser,
  assembler: TestUser,
  receiving: TestUser,
  adminOptIn: TestUser,
  buyer: TestUser;

beforeAll(async () => {
  app = await startApp();
  mail = await startTestMail();
  admin = await person(['admin'], 'admin');
  qAtOnce = await person(['quality'], 'q-now');
  qNone = await person(['quality'], 'q-none');
  qDigest = await person(['quality'], 'q-digest');
  assembler = await person(['assembler'], 'asm');
  receiving = await person(['receiving'], 'rec');
  adminOptIn = await person(['admin'], 'admin-optin');
  buyer = await person(['purchasing'], 'buyer');
});
afterAll(async () => {
  await mail.close();
  await app.close();
});

describe('notification settings', () => {
  it('needs a sign-in', async () => {
    expect((await api(app.baseUrl).get('/api/me/notifications')).status).toBe(401);
    expect((await api(app.baseUrl).put('/api/me/notifications', { kinds: {} })).status).toBe(401);
  });

  it('start from the defaults of the role: critical kinds at once, the rest of its kinds in the digest', async () => {
    const res = await api(app.baseUrl, qAtOnce.token).get('/api/me/notifications');
    expect(res.status).toBe(200);
    expect(res.body.kinds).toEqual({
      pot_life_exceeded: 'immediate',
      short_cure: 'immediate',
      expired_in_stock: 'immediate',
      expiring_soon: 'digest',
      quarantine_advised: 'digest',
      below_reorder_point: 'none',
      audit_chain_broken: 'immediate',
      lamp_check_due: 'digest',
      humidity_out_of_window: 'digest',
    });
    expect(res.body.available).not.toContain('below_reorder_point');
    expect(res.body.whenResolved).toBe(false);
    const forBuyer = await api(app.baseUrl, buyer.token).get('/api/me/notifications');
    expect(forBuyer.body.kinds).toMatchObject({ below_reorder_point: 'digest', expiring_soon: 'digest', pot_life_exceeded: 'none' });
    const forAdmin = await api(app.baseUrl, admin.token).get('/api/me/notifications');
    // An administrator gets only what concerns admin by default: a broken audit trail, at once.
    expect(Object.entries(forAdmin.body.kinds).every(([k, m]) => m === (k === 'audit_chain_broken' ? 'immediate' : 'none'))).toBe(true);
    expect(forAdmin.body.available).toHaveLength(9);
  });

  it('refuse bad input naming the field, and change nothing', async () => {
    const q = api(app.baseUrl, qNone.token);
    let res = await q.put('/api/me/notifications', { kinds: { pot_life_exceeded: 'sometimes' } });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].field).toBe('kinds.pot_life_exceeded');
    res = await q.put('/api/me/notifications', { kinds: { coffee_low: 'none' } });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].field).toMatch(/^kinds/);
    res = await q.put('/api/me/notifications', { kinds: {}, whenResolved: 'yes' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].field).toBe('whenResolved');
    res = await q.put('/api/me/notifications', { kinds: { below_reorder_point: 'immediate' } });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].field).toBe('kinds.below_reorder_point');
    res = await q.put('/api/me/notifications', {});
    expect(res.status).toBe(400);
    expect((await q.get('/api/me/notifications')).body.chosen).toEqual({});
  });

  it("save a user's own choices and audit the change", async () => {
    const res = await api(app.baseUrl, qNone.token).put('/api/me/notifications', { kinds: { pot_life_exceeded: 'none' } });
    expect(res.status).toBe(200);
    expect(res.body.kinds.pot_life_exceeded).toBe('none');
    expect(res.body.kinds.short_cure).toBe('immediate');
    expect(res.body.chosen).toEqual({ pot_life_exceeded: 'none' });
    const [entry] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, 'notifications.change'), eq(auditLog.entityId, qNone.id)));
    expect(entry.actorId).toBe(qNone.id);
    expect(entry.before).toEqual({ modes: {}, whenResolved: false });
    expect(entry.after).toEqual({ modes: { pot_life_exceeded: 'none' }, whenResolved: false });
    expect((await api(app.baseUrl, qDigest.token).put('/api/me/notifications', { kinds: { pot_life_exceeded: 'digest' } })).status).toBe(
      200,
    );
    expect((await api(app.baseUrl, assembler.token).put('/api/me/notifications', { kinds: {}, whenResolved: true })).status).toBe(200);
  });

  it("an administrator sees and changes anyone's; others may not", async () => {
    const path = `/api/users/${adminOptIn.id}/notifications`;
    expect((await api(app.baseUrl, qAtOnce.token).get(path)).status).toBe(403);
    expect((await api(app.baseUrl, qAtOnce.token).put(path, { kinds: {} })).status).toBe(403);
    expect((await api(app.baseUrl, admin.token).get('/api/users/not-an-id/notifications')).status).toBe(400);
    expect((await api(app.baseUrl, admin.token).get('/api/users/00000000-0000-4000-8000-000000000000/notifications')).status).toBe(404);
    const seen = await api(app.baseUrl, admin.token).get(`/api/users/${qAtOnce.id}/notifications`);
    expect(seen.status).toBe(200);
    expect(seen.body.user.email).toBe(qAtOnce.email);
    const set = await api(app.baseUrl, admin.token).put(path, { kinds: { pot_life_exceeded: 'immediate' } });
    expect(set.status).toBe(200);
    expect(set.body.kinds.pot_life_exceeded).toBe('immediate');
    const [entry] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, 'notifications.change'), eq(auditLog.entityId, adminOptIn.id)));
    expect(entry.actorId).toBe(admin.id);
  });
});

describe('alert e-mails', () => {
  let alertId: string;
  let mixCode: string;

  beforeAll(async () => {
    const { resin, hardener } = await createTwoPart({ potLifeMinutes: 30 });
    const resinLot = await createLot({ materialId: resin.id });
    const hardLot = await createLot({ materialId: hardener.id });
    const station = await createStation({ kind: 'moving_parts' });
    const model = await createModel({ steps: [{ stationKind: 'moving_parts' }] });
    const batch = await createBatch({ modelId: model.id, quantity: 50 });
    const { createMix } = await import('../helpers/fixtures');
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: resinLot.containers[0].id,
      hardenerContainerId: hardLot.containers[0].id,
      mixedAt: minutesAgo(45),
      potLifeEndsAt: minutesAgo(15),
    });
    await createStationLoad({ stationId: station.id, batchId: batch.id, mixId: mix.id });
    mixCode = mix.code;
    // Two servers' watches at once, then a third run: one alert, one set of e-mails.
    await Promise.all([sweep(), sweep()]);
    await sweep();
    const [alert] = await db
      .select()
      .from(alerts)
      .where(and(eq(alerts.subjectId, mix.id), eq(alerts.kind, 'pot_life_exceeded')));
    alertId = alert.id;
    await drainOutbox();
  });

  it('reach exactly the subscribers: one message each, not those who chose the digest or no e-mail', async () => {
    const rows = await db
      .select()
      .from(outgoingEmails)
      .where(and(eq(outgoingEmails.alertId, alertId), eq(outgoingEmails.kind, 'alert')));
    const recipients = rows.map((r) => r.to);
    expect(recipients.every((to) => to.length === 1)).toBe(true);
    const emails = recipients.map((to) => to[0]);
    expect(new Set(emails).size).toBe(emails.length);
    for (const u of [qAtOnce, assembler, adminOptIn]) expect(emails).toContain(u.email);
    for (const u of [qNone, qDigest, receiving, admin, buyer]) expect(emails).not.toContain(u.email);

    for (const u of [qAtOnce, assembler, adminOptIn]) {
      const got = (await capturedFor(u.email)).filter((m) => m.subject.includes(mixCode));
      expect(got).toHaveLength(1);
    }
    for (const u of [qNone, qDigest, receiving, admin]) {
      expect((await capturedFor(u.email)).filter((m) => m.subject.includes(mixCode))).toHaveLength(0);
    }
  });

  it('say the kind and the subject, what happened, what to do, link back, and carry the SDS caution', async () => {
    const [m] = (await capturedFor(assembler.email)).filter((x) => x.subject.includes(mixCode));
    expect(m.subject).toBe(`[Tacklog] Critical: Pot life passed – mix ${mixCode} at ${m.subject.split(' at ')[1]}`);
    expect(m.text).toContain('What happened:');
    expect(m.text).toContain('passed its pot life');
    expect(m.text).toContain('What to do:');
    expect(m.text).toContain(`${config.baseUrl}/alerts`);
    expect(m.text).toContain('safety data sheet (SDS)');
    expect(m.text).toContain(`plant time, ${config.plantZone}`);
    expect(m.html).toContain(`href="${config.baseUrl}/alerts"`);
    expect(m.html).not.toMatch(/<img|<script|src=/i);
  });

  it('are queued once per alert and recipient, however often asked', async () => {
    const [alert] = await db.select().from(alerts).where(eq(alerts.id, alertId));
    const again = await db.transaction((tx) => queueAlertMails(tx, alert));
    expect(again).toBe(0);
  });

  it('resolving e-mails only those who asked to hear of it', async () => {
    const res = await api(app.baseUrl, qAtOnce.token).post(`/api/alerts/${alertId}/resolve`, {
      resolution: 'Mix unloaded and discarded; drivers checked.',
    });
    expect(res.status).toBe(200);
    const rows = await db
      .select()
      .from(outgoingEmails)
      .where(and(eq(outgoingEmails.alertId, alertId), eq(outgoingEmails.kind, 'alert_resolved')));
    expect(rows.map((r) => r.to[0])).toEqual([assembler.email]);
    await drainOutbox();
    const [m] = (await capturedFor(assembler.email)).filter(
      (x) => x.subject.startsWith('[Tacklog] Resolved:') && x.subject.includes(mixCode),
    );
    expect(m.text).toContain('Mix unloaded and discarded; drivers checked.');
    expect(m.text).toContain(`by ${qAtOnce.name}`);
  });
});

describe('daily digest', () => {
  it('POST /api/notifications/digest is for administrators', async () => {
    expect((await api(app.baseUrl).post('/api/notifications/digest')).status).toBe(401);
    expect((await api(app.baseUrl, qAtOnce.token).post('/api/notifications/digest')).status).toBe(403);
  });

  it("sends today's digests now, and a second call the same day sends nothing new", async () => {
    const first = await api(app.baseUrl, admin.token).post('/api/notifications/digest');
    expect(first.status).toBe(200);
    const today = plantDateOf(new Date());
    expect(first.body.plantDate).toBe(today);
    const second = await api(app.baseUrl, admin.token).post('/api/notifications/digest');
    expect(second.status).toBe(200);
    expect(second.body.sent).toBe(0);
    await drainOutbox();
    const buyers = (await capturedFor(buyer.email)).filter((m) => m.subject.includes(`Daily digest for ${today}`));
    expect(buyers).toHaveLength(1);
    expect(buyers[0].text).toContain('PURCHASING');
    expect(buyers[0].text).toContain('Run-outs inside lead time');
    expect(buyers[0].text).toContain(config.plantName);
    expect(buyers[0].text).toContain(`plant time (${config.plantZone})`);
    const quality = (await capturedFor(qDigest.email)).filter((m) => m.subject.includes(`Daily digest for ${today}`));
    expect(quality).toHaveLength(1);
    expect(quality[0].text).toContain('Lots on hold awaiting inspection');
    expect(quality[0].text).toContain('Open alerts by kind');
    // An assembler keeps every kind at once or not at all by default: no digest.
    expect((await capturedFor(assembler.email)).filter((m) => m.subject.includes('Daily digest'))).toHaveLength(0);
  });

  it('goes once for a day even when two server processes and this one trigger it together', async () => {
    const day = new Date(Date.now() + 3 * 86_400_000);
    const date = plantDateOf(day);
    const env = { MAIL_CHILD: 'digest', MAIL_NOW: day.toISOString(), MAIL_SMTP_PORT: String(mail.catcher.port) };
    const children = [runMailChild(env), runMailChild(env)];
    const here = await queueDigests(day);
    await drainOutbox({ only: here.ids });
    const results = await Promise.all(children.map((c) => c.done));
    expect(results.every((r) => typeof r.queued === 'number')).toBe(true);
    const rows = await db
      .select()
      .from(outgoingEmails)
      .where(like(outgoingEmails.dedupeKey, `digest:${buyer.id}:${date}`));
    expect(rows).toHaveLength(1);
    expect(rows[0].status).toBe('sent');
    expect((await capturedFor(buyer.email)).filter((m) => m.subject.includes(`Daily digest for ${date}`))).toHaveLength(1);
    // A later trigger on the same day, as after a restart: nothing new.
    expect((await queueDigests(day)).queued).toBe(0);
  });
});

describe('mailbox API', () => {
  it('needs a sign-in and checks its input', async () => {
    expect((await api(app.baseUrl).get('/api/mail')).status).toBe(401);
    const bad = await api(app.baseUrl, admin.token).get('/api/mail?to=not-an-address');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('query.to');
  });

  it("shows each person their own mail, and an administrator everyone's", async () => {
    const own = await api(app.baseUrl, assembler.token).get('/api/mail?limit=200');
    expect(own.status).toBe(200);
    expect(own.body.items.length).toBeGreaterThan(0);
    expect(own.body.items.every((m: { to: string[] }) => m.to.includes(assembler.email))).toBe(true);
    expect(own.body.local).toBe(true);
    expect((await api(app.baseUrl, assembler.token).get(`/api/mail?to=${encodeURIComponent(qAtOnce.email)}`)).status).toBe(403);

    const theirs = await api(app.baseUrl, admin.token).get(`/api/mail?to=${encodeURIComponent(qAtOnce.email)}&kind=alert`);
    expect(theirs.status).toBe(200);
    const item = theirs.body.items[0];
    expect(item.to).toEqual([qAtOnce.email]);
    expect(item.status).toBe('sent');
    expect(item.captured).toBe(1);
    expect(item.text).toContain('What happened:');
    expect(item.html).toContain('<!DOCTYPE html>');
    expect(item.smtpResponse).toMatch(/^250 /);

    expect((await api(app.baseUrl, assembler.token).get(`/api/mail/${item.id}`)).status).toBe(404);
    const one = await api(app.baseUrl, qAtOnce.token).get(`/api/mail/${item.id}`);
    expect(one.status).toBe(200);
    expect(one.body.message.id).toBe(item.id);
  });
});
