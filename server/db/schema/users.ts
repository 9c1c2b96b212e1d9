import { sql } from 'drizzle-orm';
import { boolean, index, pgTable, text, timestamp, uuid, uniqueIndex, check } from 'drizzle-orm/pg-core';
import { roleEnum } from './enums';

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash').notNull(),
    roles: roleEnum('roles')
      .array()
      .notNull()
      .default(sql`'{}'::role[]`),
    active: boolean('active').notNull().default(true),
    /** Set when an administrator created the account with a temporary password: change it before anything else. */
    mustChangePassword: boolean('must_change_password').notNull().default(false),
    /** The last successful sign-in (null: never signed in since this was recorded). */
    lastSignInAt: timestamp('last_sign_in_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('users_email_lower_uq').on(sql`lower(${t.email})`), check('users_email_ck', sql`position('@' in ${t.email}) > 1`)],
);

/**
 * One row per sign-in. The session token carries the row's id; a request is signed in only while
 * its row is neither revoked (logout, password change) nor expired and the user is active.
 */
export const sessions = pgTable(
  'sessions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    /** The browser or program that signed in (User-Agent, cut to a few hundred characters), and from where. */
    userAgent: text('user_agent'),
    ip: text('ip'),
  },
  (t) => [index('sessions_user_idx').on(t.userId), index('sessions_expires_idx').on(t.expiresAt)],
);

/**
 * When a session was last used: bookkeeping kept apart from `sessions` (whose row every request
 * reads), written at most once a minute per session and process, never in the request's path.
 */
export const sessionActivity = pgTable('session_activity', {
  sessionId: uuid('session_id')
    .primaryKey()
    .references(() => sessions.id, { onDelete: 'cascade' }),
  lastSeenAt: timestamp('last_seen_at', { withTimezone: true }).notNull(),
});

/**
 * One-time password reset links an administrator sent. Only the SHA-256 of the link's token is
 * kept (a copy of this table gives no working link); a link works once, until `expiresAt`.
 */
export const passwordResets = pgTable(
  'password_resets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id),
    tokenHash: text('token_hash').notNull(),
    createdBy: uuid('created_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('password_resets_token_uq').on(t.tokenHash), index('password_resets_user_idx').on(t.userId)],
);
