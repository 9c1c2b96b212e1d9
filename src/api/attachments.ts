import type { z } from 'zod';
import { ALLOWED_UPLOAD_TYPES, UPLOAD_FIELD } from '@shared/schemas/attachments';
import { apiFetch } from './http';

/** Where an attachment is downloaded (signed in; the session cookie goes along). */
export function attachmentUrl(id: string): string {
  return `/api/attachments/${encodeURIComponent(id)}`;
}

/** The file types the server takes, for an <input accept>. */
export const UPLOAD_ACCEPT = [...ALLOWED_UPLOAD_TYPES, '.pdf', '.png', '.jpg', '.jpeg'].join(',');

/** Checks a file's declared type before sending (the server checks its first bytes too). */
export function uploadTypeProblem(file: File): string | null {
  return (ALLOWED_UPLOAD_TYPES as readonly string[]).includes(file.type)
    ? null
    : `"${file.name}" is ${file.type || 'of an unknown type'}; only PDF, PNG or JPEG files are taken.`;
}

/** Sends one file as multipart/form-data in the field the server reads, with text fields beside it. */
export function uploadFile<S extends z.ZodTypeAny>(
  path: string,
  file: File,
  fields: Record<string, string | undefined>,
  schema: S,
): Promise<z.infer<S>> {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) if (value) form.append(key, value);
  form.append(UPLOAD_FIELD, file, file.name);
  return apiFetch(path, { method: 'POST', body: form, schema });
}
