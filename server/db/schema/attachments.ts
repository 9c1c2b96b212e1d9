import { sql } from 'drizzle-orm';
import { bigint, check, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { attachmentKindEnum } from './enums';
import { users } from './users';

/** Uploaded documents (certificates of analysis, safety data sheets). Bytes live on disk. */
export const attachments = pgTable(
  'attachments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: attachmentKindEnum('kind').notNull(),
    filename: text('filename').notNull(),
    mimeType: text('mime_type').notNull(),
    sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
    sha256: text('sha256').notNull(),
    storagePath: text('storage_path').notNull(),
    uploadedBy: uuid('uploaded_by').references(() => users.id),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [check('attachments_size_ck', sql`${t.sizeBytes} > 0`), check('attachments_sha_ck', sql`${t.sha256} ~ '^[0-9a-f]{64}$'`)],
);
