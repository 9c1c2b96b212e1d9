import { z } from 'zod';
import type { EmailKind, EmailStatus } from '@shared/constants';
import { mailItemSchema, mailListSchema, type MailList } from '@shared/schemas/mail';
import { apiFetch } from './http';

export interface MailQuery {
  limit: number;
  offset: number;
  to?: string | null;
  status?: EmailStatus | null;
  kind?: EmailKind | null;
}

/** GET /api/mail: an administrator's view of all mail, or the signed-in user's own. */
export function listMail(query: MailQuery, signal?: AbortSignal): Promise<MailList> {
  return apiFetch('/api/mail', { query: { ...query }, schema: mailListSchema, signal });
}

const oneSchema = z.object({ message: mailItemSchema });

/** GET /api/mail/:id */
export async function getMail(id: string): Promise<z.infer<typeof mailItemSchema>> {
  return (await apiFetch(`/api/mail/${encodeURIComponent(id)}`, { schema: oneSchema })).message;
}
