import { z } from 'zod';
import { ATTACHMENT_KINDS } from '../constants';
import { dateSchema, idSchema, instantSchema } from './common';

/**
 * Uploaded documents: certificates of analysis (per lot) and safety data sheets (per material).
 * Uploads are multipart/form-data with the file in the field `file`; PDF, PNG or JPEG only (the
 * declared type and the file's first bytes must agree); the size limit is the server's
 * TACKLOG_MAX_UPLOAD_BYTES (413 when larger). Download: GET /api/attachments/:id (signed in).
 */
export const UPLOAD_FIELD = 'file';
export const ALLOWED_UPLOAD_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const;
export type UploadType = (typeof ALLOWED_UPLOAD_TYPES)[number];

export const attachmentSchema = z.object({
  id: idSchema,
  kind: z.enum(ATTACHMENT_KINDS),
  filename: z.string(),
  mimeType: z.string(),
  sizeBytes: z.number().int().positive(),
  /** SHA-256 of the stored bytes, lower-case hex. */
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  uploadedBy: idSchema.nullable(),
  uploadedAt: instantSchema,
  /** Where to download it (signed in). */
  url: z.string(),
});
export type Attachment = z.infer<typeof attachmentSchema>;

/** Text fields that may come with a certificate upload (multipart form fields). */
export const certificateFieldsSchema = z.object({
  /** Expiry printed on the certificate of analysis, when it has one. */
  expiresOn: z.preprocess((v) => (v === '' ? undefined : v), dateSchema.optional()),
});
export type CertificateFields = z.infer<typeof certificateFieldsSchema>;

/** `:id` route parameter. */
export const attachmentParamsSchema = z.object({ id: idSchema });

/** GET /api/attachments/:id query: `disposition=inline` to show it in the browser. */
export const attachmentDownloadQuerySchema = z.object({
  disposition: z.enum(['inline', 'attachment'], { error: 'must be inline or attachment' }).default('attachment'),
});
