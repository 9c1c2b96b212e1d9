import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  boolean,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import type { NotificationMode } from '../../../shared/notifications';
import { alertSeverityEnum, alertStateEnum, emailKindEnum, emailStatusEnum, roleEnum } from './enums';
import { users } from './users';

/** Something the compliance watch found; acknowledged and resolved by people. */
export const alerts = pgTable(
  'alerts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: text('kind').notNull(),
    severity: alertSeverityEnum('severity').notNull(),
    state: alertStateEnum('state').notNull().default('open'),
    subjectType: text('subject_type').notNull(),
    subjectId: text('subject_id').notNull(),
    message: text('message').notNull(),
    /** Roles that should hear of it. */
    audience: roleEnum('audience')
      .array()
      .notNull()
      .default(sql`'{}'::role[]`),
    data: jsonb('data').$type<Record<string, unknown>>(),
    raisedAt: timestamp('raised_at', { withTimezone: true }).notNull().defaultNow(),
    acknowledgedAt: timestamp('acknowledged_at', { withTimezone: true }),
    acknowledgedBy: uuid('acknowledged_by').references(() => users.id),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedBy: uuid('resolved_by').references(() => users.id),
    resolution: text('resolution'),
  },
  (t) => [
    // One live alert per kind and subject: the watch never raises a duplicate.
    uniqueIndex('alerts_live_uq')
      .on(t.kind, t.subjectType, t.subjectId)
      .where(sql`${t.state} <> 'resolved'`),
    index('alerts_state_idx').on(t.state, t.raisedAt),
  ],
);

/**
 * The outbox: every e-mail Tacklog sends, queued in the transaction that decides to send it,
 * then handed to SMTP by the mail worker (server/mail/worker.ts). A worker claims a row
 * (queued → sending, with a lease), sends it once, and marks it sent (with the SMTP answer),
 * queued again for a retry with back-off, or failed. A row left 'sending' past its lease
 * belonged to a stopped worker and is claimed again; its fixed Message-ID lets the retry find
 * (local catcher) or the recipient's mail program recognise (real SMTP) a copy already delivered.
 */
export const outgoingEmails = pgTable(
  'outgoing_emails',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: emailKindEnum('kind').notNull().default('other'),
    to: text('to').array().notNull(),
    subject: text('subject').notNull(),
    /** The plain-text part. */
    body: text('body').notNull(),
    /** The HTML part (inline styles only, no remote images). */
    html: text('html'),
    /** RFC 5322 Message-ID, fixed when queued, so a repeated send is the same message. */
    messageId: text('message_id')
      .notNull()
      .default(sql`'<' || gen_random_uuid() || '@tacklog.invalid>'`),
    /** Once-only key (alert+recipient, digest user+plant date): a second insert does nothing. */
    dedupeKey: text('dedupe_key'),
    recipientUserId: uuid('recipient_user_id').references(() => users.id),
    status: emailStatusEnum('status').notNull().default('queued'),
    alertId: uuid('alert_id').references(() => alerts.id),
    attempts: integer('attempts').notNull().default(0),
    /** Not before this instant (back-off after a failed attempt). */
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    /** While 'sending': the worker holding it, and until when its claim holds. */
    claimedBy: text('claimed_by'),
    leaseUntil: timestamp('lease_until', { withTimezone: true }),
    lastError: text('last_error'),
    /** The SMTP server's last answer (e.g. "250 2.0.0 OK queued as …" or a 4xx/5xx refusal). */
    smtpResponse: text('smtp_response'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [
    index('outgoing_emails_status_idx').on(t.status, t.createdAt),
    index('outgoing_emails_due_idx').on(t.status, t.nextAttemptAt),
    uniqueIndex('outgoing_emails_message_id_uq').on(t.messageId),
    uniqueIndex('outgoing_emails_dedupe_uq').on(t.dedupeKey),
    index('outgoing_emails_recipient_idx').on(t.recipientUserId, t.createdAt),
  ],
);

/**
 * Messages received by the local SMTP catcher (development, demo and tests, when no real SMTP
 * server is configured), parsed with mailparser. Every delivery is kept, repeats included.
 */
export const capturedEmails = pgTable(
  'captured_emails',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    messageId: text('message_id'),
    envelopeFrom: text('envelope_from'),
    envelopeTo: text('envelope_to').array().notNull(),
    from: text('from'),
    to: text('to').array().notNull(),
    subject: text('subject').notNull(),
    text: text('text'),
    html: text('html'),
    sizeBytes: integer('size_bytes').notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('captured_emails_message_id_idx').on(t.messageId), index('captured_emails_received_idx').on(t.receivedAt)],
);

/**
 * A user's e-mail choices: per alert kind 'immediate' | 'digest' | 'none' (kinds not listed
 * follow the defaults of the user's roles, shared/notifications.ts), and whether to hear when
 * an alert they were e-mailed about is resolved.
 */
export const notificationSettings = pgTable('notification_settings', {
  userId: uuid('user_id')
    .primaryKey()
    .references(() => users.id),
  modes: jsonb('modes').$type<Record<string, NotificationMode>>().notNull().default({}),
  whenResolved: boolean('when_resolved').notNull().default(false),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: uuid('updated_by').references(() => users.id),
});

/** Repeats of a state-changing request with the same Idempotency-Key get the first response. */
export const idempotencyKeys = pgTable(
  'idempotency_keys',
  {
    key: text('key').notNull(),
    actorId: uuid('actor_id')
      .notNull()
      .references(() => users.id),
    method: text('method').notNull(),
    path: text('path').notNull(),
    /** SHA-256 of the first request's query and JSON body: a repeat with another body is refused. */
    requestHash: text('request_hash'),
    statusCode: integer('status_code'),
    responseBody: jsonb('response_body'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.actorId, t.key] }), index('idempotency_keys_created_idx').on(t.createdAt)],
);

/**
 * Append-only audit trail (a trigger refuses UPDATE and DELETE), chained for tamper evidence:
 * at commit each row gets the next `chainSeq`, the previous row's hash and its own hash
 * (SHA-256 over the row's canonical text and the previous hash), under one lock so the chain
 * is linear. See drizzle/*_audit_chain.sql and server/services/audit-chain.
 */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    actorId: uuid('actor_id').references(() => users.id),
    action: text('action').notNull(),
    entityType: text('entity_type').notNull(),
    entityId: text('entity_id').notNull(),
    before: jsonb('before'),
    after: jsonb('after'),
    reason: text('reason'),
    chainSeq: bigint('chain_seq', { mode: 'number' }),
    prevHash: text('prev_hash'),
    hash: text('hash'),
  },
  (t) => [
    index('audit_log_entity_idx').on(t.entityType, t.entityId, t.at),
    index('audit_log_at_idx').on(t.at),
    uniqueIndex('audit_log_chain_seq_key').on(t.chainSeq),
    index('audit_log_actor_idx').on(t.actorId, t.at),
  ],
);

/** Plant-wide settings (notification recipients, baseline failure rate, …). */
export const settings = pgTable('settings', {
  key: text('key').primaryKey(),
  value: jsonb('value').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: uuid('updated_by').references(() => users.id),
});
