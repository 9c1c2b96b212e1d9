/**
 * The Mailbox (GET /api/mail): what Tacklog sent or is sending, with the copy the local catcher
 * received when it caught the message. An administrator reads everyone's mail; everyone else
 * the messages sent to them.
 */
import { and, count, desc, eq, sql, type SQL } from 'drizzle-orm';
import { db } from '../../db/client';
import { outgoingEmails } from '../../db/schema';
import type { MailItem, MailList, MailListQuery } from '../../../shared/schemas/mail';
import { can } from '../../../shared/permissions';
import { forbidden, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { mailTransport } from './transport';
import { config } from '../../config';

const sentTo = (email: string) => sql`lower(${email}) IN (SELECT lower(x) FROM unnest(${outgoingEmails.to}) AS x)`;

// Written out in full: inside a sub-select drizzle would name the column without its table,
// and it would then mean captured_emails' own message_id.
const outboxMessageId = sql.raw('"outgoing_emails"."message_id"');

const columns = {
  row: outgoingEmails,
  captured: sql<number>`(SELECT count(*)::int FROM captured_emails c WHERE c.message_id = ${outboxMessageId})`,
  capturedText: sql<
    string | null
  >`(SELECT c.text FROM captured_emails c WHERE c.message_id = ${outboxMessageId} ORDER BY c.received_at DESC LIMIT 1)`,
  capturedHtml: sql<
    string | null
  >`(SELECT c.html FROM captured_emails c WHERE c.message_id = ${outboxMessageId} ORDER BY c.received_at DESC LIMIT 1)`,
};

type Row = { row: typeof outgoingEmails.$inferSelect; captured: number; capturedText: string | null; capturedHtml: string | null };

function toItem(r: Row): MailItem {
  const o = r.row;
  return {
    id: o.id,
    kind: o.kind,
    to: o.to,
    subject: o.subject,
    text: r.capturedText ?? o.body,
    html: r.captured ? r.capturedHtml : o.html,
    status: o.status,
    createdAt: o.createdAt.toISOString(),
    sentAt: o.sentAt?.toISOString() ?? null,
    attempts: o.attempts,
    nextAttemptAt: o.status === 'queued' ? o.nextAttemptAt.toISOString() : null,
    lastError: o.lastError,
    smtpResponse: o.smtpResponse,
    messageId: o.messageId,
    alertId: o.alertId,
    captured: r.captured,
  };
}

/**
 * A password reset link is for its recipient's eyes only: an administrator reading everyone's
 * mail sees that it was sent, not the link (which would let them set the person's password).
 */
function forReader(actor: Actor, item: MailItem): MailItem {
  if (item.kind !== 'password_reset' || item.to.some((to) => to.toLowerCase() === actor.email.toLowerCase())) return item;
  return {
    ...item,
    text: `A one-time password reset link was sent to ${item.to.join(', ')}. Only its recipient sees the link.`,
    html: null,
  };
}

/** Whose mail the actor may read: everyone's (admin) or their own (filters added here). */
function scope(actor: Actor, to: string | undefined): SQL[] {
  if (can(actor.roles, 'mail.readAll')) return to ? [sentTo(to)] : [];
  if (to && to.toLowerCase() !== actor.email.toLowerCase()) throw forbidden('You can read only the messages sent to you.');
  return [sentTo(actor.email)];
}

export async function listMail(actor: Actor, query: MailListQuery): Promise<MailList> {
  const filters = scope(actor, query.to);
  if (query.status) filters.push(eq(outgoingEmails.status, query.status));
  if (query.kind) filters.push(eq(outgoingEmails.kind, query.kind));
  const where = filters.length ? and(...filters) : undefined;
  const [rows, [{ n }]] = await Promise.all([
    db
      .select(columns)
      .from(outgoingEmails)
      .where(where)
      .orderBy(desc(outgoingEmails.createdAt), desc(outgoingEmails.id))
      .limit(query.limit)
      .offset(query.offset),
    db.select({ n: count() }).from(outgoingEmails).where(where),
  ]);
  const transport = mailTransport();
  return {
    items: rows.map((r) => forReader(actor, toItem(r))),
    total: n,
    transport: transport?.describe ?? null,
    local: transport?.local ?? false,
    zone: config.plantZone,
  };
}

export async function getMail(actor: Actor, id: string): Promise<MailItem> {
  const [row] = await db
    .select(columns)
    .from(outgoingEmails)
    .where(and(eq(outgoingEmails.id, id), ...scope(actor, undefined)));
  if (!row) throw notFound('That message');
  return forReader(actor, toItem(row));
}
