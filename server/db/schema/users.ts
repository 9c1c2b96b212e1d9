import { sql } from 'drizzle-orm';
import { boolean, pgTable, text, timestamp, uuid, uniqueIndex, check } from 'drizzle-orm/pg-core';
import { roleEnum } from './enums';

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash').notNull(),
    roles: roleEnum('roles').array().notNull().default(sql`'{}'::role[]`),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('users_email_lower_uq').on(sql`lower(${t.email})`),
    check('users_email_ck', sql`position('@' in ${t.email}) > 1`),
  ],
);
