import { sql } from 'drizzle-orm';
import { bigint, bigserial, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { alertSeverityEnum, alertStateEnum, emailStatusEnum, roleEnum } from './enums';
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
    audience: roleEnum('audience').array().notNull().default(sql`'{}'::role[]`),
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
    uniqueIndex('alerts_live_uq').on(t.kind, t.subjectType, t.subjectId).where(sql`${t.state} <> 'resolved'`),
    index('alerts_state_idx').on(t.state, t.raisedAt),
  ],
);

/** Outgoing e-mail, queued and then handed to the SMTP transport. */
export const outgoingEmails = pgTable(
  'outgoing_emails',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    to: text('to').array().notNull(),
    subject: text('subject').notNull(),
    body: text('body').notNull(),
    status: emailStatusEnum('status').notNull().default('queued'),
    alertId: uuid('alert_id').references(() => alerts.id),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [index('outgoing_emails_status_idx').on(t.status, t.createdAt)],
);

/** Repeats of a state-changing request with the same Idempotency-Key get the first response. */
export const idempotencyKeys = pgTable(
  'idempotency_keys',
  {
    key: text('key').notNull(),
    actorId: uuid('actor_id').notNull().references(() => users.id),
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
