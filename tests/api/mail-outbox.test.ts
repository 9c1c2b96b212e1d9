/**
 * The outbox worker against the local catcher: a temporary SMTP refusal is retried with
 * back-off and then sent; a permanent refusal fails at once with the server's answer; a worker
 * process killed mid-send neither loses nor duplicates the message.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { capturedEmails, outgoingEmails } from '../../server/db/schema';
import { queueEmail } from '../../server/services/mail/outbox';
import { backoffMs, drainOutbox } from '../../server/services/mail/worker';
import { smtpTransport } from '../../server/services/mail/transport';
import { migrateTestDatabase } from '../helpers/db';
import { sfx } from '../helpers/fixtures';
import { capturedFor, gate, runMailChild, startTestMail, type TestMail } from '../helpers/mail';

let mail: TestMail;

beforeAll(async () => {
  await migrateTestDatabase();
  mail = await startTestMail();
});
afterAll(() => mail.close());
afterEach(() => {
  mail.hooks.rcpt = undefined;
  mail.hooks.afterStore = undefined;
});

async function queueOne(to: string) {
  const id = await queueEmail(db, {
    kind: 'other',
    to: [to],
    subject: `Outbox test ${sfx()}`,
    text: 'Plain part.',
    html: '<p>HTML part.</p>',
  });
  if (!id) throw new Error('not queued');
  return id;
}

const rowOf = async (id: string) => (await db.select().from(outgoingEmails).where(eq(outgoingEmails.id, id)))[0];
const capturedById = (messageId: string) => db.select().from(capturedEmails).where(eq(capturedEmails.messageId, messageId));
const later = (ms: number) => () => new Date(Date.now() + ms);

describe('outbox worker', () => {
  it('sends a queued message once, through SMTP, and keeps the answer', async () => {
    const to = `outbox-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    const result = await drainOutbox({ only: [id] });
    expect(result).toEqual({ sent: 1, retried: 0, failed: 0, recovered: 0 });
    const row = await rowOf(id);
    expect(row.status).toBe('sent');
    expect(row.attempts).toBe(1);
    expect(row.smtpResponse).toMatch(/^250 /);
    const got = await capturedFor(to);
    expect(got).toHaveLength(1);
    expect(got[0].messageId).toBe(row.messageId);
    expect(got[0].text?.trim()).toBe('Plain part.');
    expect(got[0].html).toContain('<p>HTML part.</p>');
    // Nothing more to do: a second round sends nothing again.
    expect((await drainOutbox({ only: [id] })).sent).toBe(0);
  });

  it('survives a temporary SMTP failure and sends on the retry, after the back-off', async () => {
    const to = `flaky-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    let refusals = 0;
    mail.hooks.rcpt = (address) => {
      if (address === to && refusals === 0) {
        refusals += 1;
        throw Object.assign(new Error('Mailbox busy, try again later'), { responseCode: 451 });
      }
    };
    expect(await drainOutbox({ only: [id] })).toMatchObject({ sent: 0, retried: 1 });
    let row = await rowOf(id);
    expect(row.status).toBe('queued');
    expect(row.attempts).toBe(1);
    expect(row.lastError).toMatch(/451|busy/i);
    expect(row.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() + backoffMs(1) - 10_000);
    expect(await capturedFor(to)).toHaveLength(0);

    // Not due yet: nothing is sent before the back-off has passed.
    expect((await drainOutbox({ only: [id] })).sent).toBe(0);
    // After it: sent once.
    expect(await drainOutbox({ only: [id], now: later(backoffMs(1) + 1000) })).toMatchObject({ sent: 1 });
    row = await rowOf(id);
    expect(row.status).toBe('sent');
    expect(row.attempts).toBe(2);
    expect(row.smtpResponse).toMatch(/^250 /);
    expect(await capturedFor(to)).toHaveLength(1);
  });

  it('backs off 1, 2, 4 … minutes, at most an hour', () => {
    expect([1, 2, 3, 4, 7, 8, 20].map((n) => backoffMs(n) / 60_000)).toEqual([1, 2, 4, 8, 60, 60, 60]);
  });

  it('fails at once on a permanent refusal (5xx), keeping the answer', async () => {
    const to = `nobody-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    mail.hooks.rcpt = (address) => {
      if (address === to) throw Object.assign(new Error('No such mailbox here'), { responseCode: 550 });
    };
    expect(await drainOutbox({ only: [id] })).toMatchObject({ failed: 1 });
    const row = await rowOf(id);
    expect(row.status).toBe('failed');
    expect(row.lastError).toMatch(/550|No such mailbox/);
    expect(row.smtpResponse).toMatch(/^550/);
  });

  it('gives up after the last attempt', async () => {
    const to = `down-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    mail.hooks.rcpt = (address) => {
      if (address === to) throw Object.assign(new Error('Try later'), { responseCode: 421 });
    };
    expect(await drainOutbox({ only: [id], maxAttempts: 2 })).toMatchObject({ retried: 1 });
    expect(await drainOutbox({ only: [id], maxAttempts: 2, now: later(backoffMs(1) + 1000) })).toMatchObject({ failed: 1 });
    const row = await rowOf(id);
    expect(row.status).toBe('failed');
    expect(row.lastError).toMatch(/gave up after 2 attempts/);
  });

  it('two workers racing for the same rows send each once (FOR UPDATE SKIP LOCKED)', async () => {
    const to = `race-${sfx()}@plant.test`.toLowerCase();
    const ids = await Promise.all([1, 2, 3, 4, 5, 6].map(() => queueOne(to)));
    const [a, b] = await Promise.all([drainOutbox({ only: ids, workerId: 'A' }), drainOutbox({ only: ids, workerId: 'B' })]);
    expect(a.sent + b.sent).toBe(6);
    expect(await capturedFor(to)).toHaveLength(6);
    const messageIds = new Set((await capturedFor(to)).map((m) => m.messageId));
    expect(messageIds.size).toBe(6);
  });
});

describe('a server stopped mid-send', () => {
  it('after the mail server got the message: the restarted worker finds it by Message-ID and does not send it again', async () => {
    const to = `crash-after-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    const { messageId } = await rowOf(id);
    const stored = gate();
    const release = gate();
    mail.hooks.afterStore = async (m) => {
      if (m.messageId !== messageId) return;
      stored.open();
      await release.promise; // the 250 answer never reaches the killed process
    };
    const child = runMailChild({ MAIL_CHILD: 'drain', MAIL_ONLY: id, MAIL_SMTP_PORT: String(mail.catcher.port), MAIL_LEASE_MS: '60000' });
    await stored.promise;
    await child.kill();
    release.open();

    let row = await rowOf(id);
    expect(row.status).toBe('sending');
    expect(row.claimedBy).toContain(`:${child.pid}:`);
    // While its lease holds, nobody else takes it.
    expect(await drainOutbox({ only: [id] })).toEqual({ sent: 0, retried: 0, failed: 0, recovered: 0 });
    // After the lease: claimed again, found delivered, marked sent without a second copy.
    expect(await drainOutbox({ only: [id], now: later(61_000) })).toEqual({ sent: 0, retried: 0, failed: 0, recovered: 1 });
    row = await rowOf(id);
    expect(row.status).toBe('sent');
    expect(row.attempts).toBe(2);
    expect(row.smtpResponse).toMatch(/not sent again/);
    expect(await capturedById(messageId)).toHaveLength(1);
  });

  it('before the mail server got the message: the restarted worker sends it, once', async () => {
    const to = `crash-before-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    const { messageId } = await rowOf(id);
    const reached = gate();
    const release = gate();
    mail.hooks.rcpt = async (address) => {
      if (address !== to) return;
      reached.open();
      await release.promise;
      throw Object.assign(new Error('connection gone'), { responseCode: 421 });
    };
    const child = runMailChild({ MAIL_CHILD: 'drain', MAIL_ONLY: id, MAIL_SMTP_PORT: String(mail.catcher.port), MAIL_LEASE_MS: '60000' });
    await reached.promise;
    await child.kill();
    mail.hooks.rcpt = undefined;
    release.open();

    expect((await rowOf(id)).status).toBe('sending');
    expect(await capturedById(messageId)).toHaveLength(0);
    expect(await drainOutbox({ only: [id], now: later(61_000) })).toMatchObject({ sent: 1, recovered: 0 });
    expect((await rowOf(id)).status).toBe('sent');
    expect(await capturedById(messageId)).toHaveLength(1);
  });

  it('through a real SMTP server (which cannot be asked), the retry carries the same Message-ID, so the copy is recognisable', async () => {
    const to = `crash-smtp-${sfx()}@plant.test`.toLowerCase();
    const id = await queueOne(to);
    const { messageId } = await rowOf(id);
    const stored = gate();
    const release = gate();
    mail.hooks.afterStore = async (m) => {
      if (m.messageId !== messageId) return;
      stored.open();
      await release.promise;
    };
    const child = runMailChild({ MAIL_CHILD: 'drain', MAIL_ONLY: id, MAIL_SMTP_PORT: String(mail.catcher.port), MAIL_LEASE_MS: '60000' });
    await stored.promise;
    await child.kill();
    release.open();
    mail.hooks.afterStore = undefined;
    const plainSmtp = smtpTransport(mail.catcher.url);
    try {
      expect(await drainOutbox({ only: [id], transport: plainSmtp, now: later(61_000) })).toMatchObject({ sent: 1 });
    } finally {
      plainSmtp.close();
    }
    const copies = await capturedById(messageId);
    expect(copies).toHaveLength(2);
    expect(new Set(copies.map((c) => c.messageId))).toEqual(new Set([messageId]));
    expect((await rowOf(id)).status).toBe('sent');
  });
});
