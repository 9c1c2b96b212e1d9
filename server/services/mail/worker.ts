/**
 * The outbox worker. Each round claims ONE due row with FOR UPDATE SKIP LOCKED (so several
 * workers in several processes never take the same row), marks it 'sending' under a lease and
 * commits; then sends it once; then marks it sent (with the SMTP answer), queued again with
 * back-off (a temporary failure), or failed (a permanent refusal, or too many attempts).
 *
 * A worker stopped between claim and mark leaves the row 'sending'; when the lease runs out
 * another worker claims it again. Before sending again it asks the transport whether the
 * message already arrived (the local catcher looks up its Message-ID: no duplicate); a real
 * SMTP server cannot be asked, so the message goes again with the same Message-ID, which
 * recipients' mail programs recognise as the same message. Nothing is lost either way.
 */
import os from 'node:os';
import crypto from 'node:crypto';
import { and, eq, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { outgoingEmails } from '../../db/schema';
import { config } from '../../config';
import { mailTransport, type MailTransport } from './transport';
import { logger } from '../../logger';

export const DEFAULT_LEASE_MS = 5 * 60_000;
export const DEFAULT_MAX_ATTEMPTS = 8;

/** Wait before attempt n+1 after n failed attempts: 1, 2, 4, 8 … minutes, at most an hour. */
export function backoffMs(attempts: number): number {
  return Math.min(60_000 * 2 ** Math.max(0, attempts - 1), 60 * 60_000);
}

export interface DrainOptions {
  transport?: MailTransport;
  workerId?: string;
  /** The clock (tests move it past a lease or a back-off). */
  now?: () => Date;
  leaseMs?: number;
  maxAttempts?: number;
  /** Only these outbox rows (e.g. the digests just queued). */
  only?: string[];
  /** Stop after this many rows (default: until nothing is due). */
  limit?: number;
}

export interface DrainResult {
  sent: number;
  retried: number;
  failed: number;
  /** Rows found already delivered after an interrupted attempt, marked sent without sending. */
  recovered: number;
}

type ClaimedRow = {
  id: string;
  to: string[];
  subject: string;
  body: string;
  html: string | null;
  message_id: string;
  attempts: number;
  was: 'queued' | 'sending';
};

export const defaultWorkerId = `${os.hostname()}:${process.pid}:${crypto.randomBytes(3).toString('hex')}`;

async function claimOne(workerId: string, now: Date, leaseMs: number, only?: string[]): Promise<ClaimedRow | null> {
  const leaseUntil = new Date(now.getTime() + leaseMs);
  const onlyFilter = only ? sql`AND id = ANY(${`{${only.join(',')}}`}::uuid[])` : sql``;
  const result = await db.execute<ClaimedRow>(sql`
    WITH picked AS (
      SELECT id, status AS was FROM outgoing_emails
      -- PostgreSQL keeps microseconds and a JS Date milliseconds: a row queued within the same
      -- millisecond as \`now\` is due too (not left for the next round).
      WHERE ((status = 'queued' AND next_attempt_at < ${now}::timestamptz + interval '1 millisecond') OR (status = 'sending' AND lease_until < ${now}))
        ${onlyFilter}
      ORDER BY next_attempt_at, created_at
      LIMIT 1
      FOR UPDATE SKIP LOCKED
    )
    UPDATE outgoing_emails o
    SET status = 'sending', claimed_by = ${workerId}, lease_until = ${leaseUntil}, attempts = o.attempts + 1
    FROM picked WHERE o.id = picked.id
    RETURNING o.id, o.to, o.subject, o.body, o.html, o.message_id, o.attempts, picked.was`);
  return result.rows[0] ?? null;
}

/** Only the worker that holds the claim marks the row. */
function heldBy(id: string, workerId: string) {
  return and(eq(outgoingEmails.id, id), eq(outgoingEmails.status, 'sending'), eq(outgoingEmails.claimedBy, workerId));
}

async function markSent(id: string, workerId: string, response: string): Promise<void> {
  await db
    .update(outgoingEmails)
    .set({ status: 'sent', sentAt: new Date(), smtpResponse: response, leaseUntil: null, lastError: null })
    .where(heldBy(id, workerId));
}

function smtpCode(err: unknown): number | undefined {
  const code = (err as { responseCode?: unknown }).responseCode;
  return typeof code === 'number' ? code : undefined;
}

async function markFailedAttempt(
  row: ClaimedRow,
  workerId: string,
  err: unknown,
  now: Date,
  maxAttempts: number,
): Promise<'retried' | 'failed'> {
  const code = smtpCode(err);
  const permanent = code !== undefined && code >= 500 && code < 600;
  const giveUp = permanent || row.attempts >= maxAttempts;
  const message = err instanceof Error ? err.message : String(err);
  const response = (err as { response?: unknown }).response;
  await db
    .update(outgoingEmails)
    .set({
      status: giveUp ? 'failed' : 'queued',
      nextAttemptAt: new Date(now.getTime() + backoffMs(row.attempts)),
      leaseUntil: null,
      lastError: giveUp && !permanent ? `${message} (gave up after ${row.attempts} attempts)` : message,
      smtpResponse: typeof response === 'string' ? response : null,
    })
    .where(heldBy(row.id, workerId));
  return giveUp ? 'failed' : 'retried';
}

/** Sends what is due, one row at a time, until nothing is due (or `limit` rows). */
export async function drainOutbox(options: DrainOptions = {}): Promise<DrainResult> {
  const transport = options.transport ?? mailTransport();
  const result: DrainResult = { sent: 0, retried: 0, failed: 0, recovered: 0 };
  if (!transport) return result;
  const workerId = options.workerId ?? defaultWorkerId;
  const clock = options.now ?? (() => new Date());
  const leaseMs = options.leaseMs ?? DEFAULT_LEASE_MS;
  const maxAttempts = options.maxAttempts ?? DEFAULT_MAX_ATTEMPTS;

  for (let done = 0; options.limit === undefined || done < options.limit; done++) {
    const now = clock();
    const row = await claimOne(workerId, now, leaseMs, options.only);
    if (!row) break;
    if (row.was === 'sending' && transport.alreadyDelivered && (await transport.alreadyDelivered(row.message_id))) {
      await markSent(row.id, workerId, 'Delivered before an interrupted attempt (found by its Message-ID); not sent again.');
      result.recovered += 1;
      continue;
    }
    try {
      const answer = await transport.send({
        from: config.mail.from,
        to: row.to,
        subject: row.subject,
        text: row.body,
        html: row.html,
        messageId: row.message_id,
        headers: { 'Auto-Submitted': 'auto-generated', 'X-Tacklog-Outbox-Id': row.id },
      });
      await markSent(row.id, workerId, answer.response);
      result.sent += 1;
    } catch (err) {
      const outcome = await markFailedAttempt(row, workerId, err, now, maxAttempts);
      result[outcome] += 1;
      logger.warn(
        `mail: ${outcome === 'failed' ? 'gave up on' : 'will retry'} ${row.message_id}: ${err instanceof Error ? err.message : String(err)}`,
      );
    }
  }
  return result;
}

type Listener = () => void;
const listeners = new Set<Listener>();

/** Tells this process's worker that mail was queued (it sends at once instead of at its next round). */
export function mailQueued(): void {
  for (const l of listeners) l();
}

export function onMailQueued(listener: Listener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}
