/**
 * Upload checks and storage for documents (certificates of analysis, safety data sheets).
 * Only PDF, PNG and JPEG are accepted, and the declared type must agree with the file's first
 * bytes (its "magic number"). Bytes go to config.uploadDir under a random name; the row in
 * `attachments` records the SHA-256. If anything fails after the file was written, the file is
 * removed again, so a refused upload leaves nothing behind.
 */
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { config } from '../../config';
import type { Tx } from '../../db/client';
import { attachments } from '../../db/schema';
import { fieldError } from '../../errors';
import type { AttachmentKind } from '../../../shared/constants';
import { ALLOWED_UPLOAD_TYPES, UPLOAD_FIELD, type UploadType } from '../../../shared/schemas/attachments';
import type { AttachmentRow } from '../lots/present';

/** What the multipart parser hands over (multer's memory storage). */
export interface UploadedFile {
  originalname: string;
  mimetype: string;
  size: number;
  buffer: Buffer;
}

const EXTENSIONS: Record<UploadType, string> = { 'application/pdf': 'pdf', 'image/png': 'png', 'image/jpeg': 'jpg' };

/**
 * The type a file's first bytes show: PDF starts with "%PDF-" (ISO 32000-1 §7.5.2), PNG with
 * 89 50 4E 47 0D 0A 1A 0A (PNG specification §5.2), JPEG with FF D8 FF (JFIF/Exif SOI marker).
 */
export function sniffType(bytes: Uint8Array): UploadType | null {
  const starts = (sig: number[]) => sig.every((b, i) => bytes[i] === b);
  if (starts([0x25, 0x50, 0x44, 0x46, 0x2d])) return 'application/pdf';
  if (starts([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
  if (starts([0xff, 0xd8, 0xff])) return 'image/jpeg';
  return null;
}

function declaredType(mimetype: string): string {
  const t = mimetype.toLowerCase().split(';')[0].trim();
  return t === 'image/jpg' || t === 'image/pjpeg' ? 'image/jpeg' : t;
}

/** Refuses a missing, empty or wrong-type upload (400 naming `file`); returns its type. */
export function checkUpload(file: UploadedFile | undefined): UploadType {
  if (!file) throw fieldError(UPLOAD_FIELD, `is required: send the document as multipart/form-data in the field "${UPLOAD_FIELD}"`);
  if (file.size === 0 || file.buffer.length === 0) throw fieldError(UPLOAD_FIELD, 'is empty');
  const declared = declaredType(file.mimetype);
  if (!(ALLOWED_UPLOAD_TYPES as readonly string[]).includes(declared)) {
    throw fieldError(UPLOAD_FIELD, `must be a PDF, PNG or JPEG document (it was sent as ${declared || 'an unknown type'})`);
  }
  const actual = sniffType(file.buffer);
  if (actual !== declared) {
    throw fieldError(
      UPLOAD_FIELD,
      `content is not a ${EXTENSIONS[declared as UploadType].toUpperCase()} file, although it was sent as ${declared}`,
    );
  }
  return actual;
}

/**
 * Characters never kept in a file name: C0 and C1 controls, DEL, and the Unicode bidirectional
 * marks, embeddings, overrides and isolates (Unicode UAX #9: U+061C, U+200E–U+200F,
 * U+202A–U+202E, U+2066–U+2069), which can make "evil\u202Efdp.exe" read as "evilexe.pdf".
 * Zero-width characters and the BOM go too, so no invisible difference hides in a name.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const UNSAFE_NAME_CHARS = /[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff"]/g;

/** Extensions that name each accepted type; the first is the one given to a file without one. */
const TYPE_EXTENSIONS: Record<UploadType, string[]> = { 'application/pdf': ['pdf'], 'image/png': ['png'], 'image/jpeg': ['jpg', 'jpeg'] };

/**
 * A file name safe to keep and to send back: no path, no control or bidi characters, at most 200
 * characters, and an extension that matches the checked type (a PDF sent as "poly.html" is kept
 * as "poly.pdf"), so a download never opens as something else.
 */
export function cleanFilename(name: string, type: UploadType): string {
  const printable = name.replace(/\\/g, '/').replace(UNSAFE_NAME_CHARS, '');
  let base = path.posix.basename(printable).trim().replace(/^\.+/, '');
  const ext = path.posix.extname(base).slice(1).toLowerCase();
  const allowed = TYPE_EXTENSIONS[type];
  if (!allowed.includes(ext)) base = `${base.slice(0, base.length - (ext ? ext.length + 1 : 0)).trim() || 'document'}.${allowed[0]}`;
  if (base.length > 200) {
    const keep = path.posix.extname(base);
    base = `${base.slice(0, 200 - keep.length)}${keep}`;
  }
  return base;
}

/** Absolute path of a stored attachment, refusing anything outside the upload folder. */
export function storedPath(storagePath: string): string {
  const root = path.resolve(config.uploadDir);
  const full = path.resolve(root, storagePath);
  if (!full.startsWith(root + path.sep)) throw new Error(`attachment path escapes the upload folder: ${storagePath}`);
  return full;
}

/**
 * Writes the checked file to disk, then runs `work` (which records the row in a transaction).
 * If `work` fails, the file is deleted again and the error rethrown.
 */
export async function withStoredFile<T>(
  file: UploadedFile,
  type: UploadType,
  work: (stored: { storagePath: string; sha256: string }) => Promise<T>,
): Promise<T> {
  const storagePath = `${crypto.randomUUID()}.${EXTENSIONS[type]}`;
  const full = storedPath(storagePath);
  const sha256 = crypto.createHash('sha256').update(file.buffer).digest('hex');
  await fs.mkdir(path.dirname(full), { recursive: true });
  await fs.writeFile(full, file.buffer, { flag: 'wx' });
  try {
    return await work({ storagePath, sha256 });
  } catch (err) {
    await fs.rm(full, { force: true });
    throw err;
  }
}

/** Inserts the attachment row for a file stored by withStoredFile. */
export async function insertAttachment(
  tx: Tx,
  input: { kind: AttachmentKind; file: UploadedFile; type: UploadType; storagePath: string; sha256: string; uploadedBy: string },
): Promise<AttachmentRow> {
  const [row] = await tx
    .insert(attachments)
    .values({
      kind: input.kind,
      filename: cleanFilename(input.file.originalname, input.type),
      mimeType: input.type,
      sizeBytes: input.file.buffer.length,
      sha256: input.sha256,
      storagePath: input.storagePath,
      uploadedBy: input.uploadedBy,
    })
    .returning();
  return row;
}
