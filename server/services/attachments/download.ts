import fs from 'node:fs/promises';
import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { attachments } from '../../db/schema';
import { AppError, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { cleanFilename, storedPath } from './store';
import { toAttachment } from '../lots/present';
import { ALLOWED_UPLOAD_TYPES, type Attachment, type UploadType } from '../../../shared/schemas/attachments';

/** Any signed-in person may read documents; the route checks the session. */
export async function getAttachment(_actor: Actor, id: string): Promise<Attachment> {
  const [row] = await db.select().from(attachments).where(eq(attachments.id, id));
  if (!row) throw notFound('The document');
  return toAttachment(row);
}

/** The document and its bytes, for download. */
export async function readAttachment(_actor: Actor, id: string): Promise<{ attachment: Attachment; bytes: Buffer }> {
  const [row] = await db.select().from(attachments).where(eq(attachments.id, id));
  if (!row) throw notFound('The document');
  try {
    const bytes = await fs.readFile(storedPath(row.storagePath));
    return { attachment: toAttachment(row), bytes };
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') {
      throw new AppError(
        'FILE_MISSING',
        `The file of ${row.filename} is missing from the server's upload folder; ask an administrator to restore it.`,
        404,
      );
    }
    throw err;
  }
}

/**
 * `Content-Disposition` value with an ASCII fallback and the UTF-8 name (RFC 6266, RFC 5987).
 * The name is cleaned again with the document's checked type (rows stored before names were
 * cleaned on upload get the same treatment).
 */
export function contentDisposition(filename: string, inline: boolean, mimeType: string): string {
  const name = (ALLOWED_UPLOAD_TYPES as readonly string[]).includes(mimeType)
    ? cleanFilename(filename, mimeType as UploadType)
    : cleanFilename(filename, 'application/pdf');
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${inline ? 'inline' : 'attachment'}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
