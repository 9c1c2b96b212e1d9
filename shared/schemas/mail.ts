import { z } from 'zod';
import { EMAIL_KINDS, EMAIL_STATUSES } from '../constants';
import { idSchema, instantSchema } from './common';

/** One message of the Mailbox (GET /api/mail): the outbox row, with what the local catcher received. */
export const mailItemSchema = z.object({
  id: idSchema,
  kind: z.enum(EMAIL_KINDS),
  to: z.array(z.string()),
  subject: z.string(),
  /** Plain-text part (as received by the local catcher when it caught the message). */
  text: z.string(),
  /** HTML part, when the message has one. Show it only in a sandboxed frame. */
  html: z.string().nullable().optional(),
  status: z.enum(EMAIL_STATUSES),
  createdAt: instantSchema,
  sentAt: instantSchema.nullable(),
  attempts: z.number().int().nonnegative(),
  nextAttemptAt: instantSchema.nullable(),
  lastError: z.string().nullable(),
  /** The SMTP server's answer to the last attempt. */
  smtpResponse: z.string().nullable(),
  messageId: z.string(),
  alertId: z.string().nullable(),
  /** Times the local catcher received it (0 with a real SMTP server; more than 1 would be a duplicate). */
  captured: z.number().int().nonnegative(),
});
export type MailItem = z.infer<typeof mailItemSchema>;

export const mailListQuerySchema = z.object({
  to: z.string().trim().email({ message: 'must be an e-mail address' }).optional(),
  status: z.enum(EMAIL_STATUSES, { message: `must be one of ${EMAIL_STATUSES.join(', ')}` }).optional(),
  kind: z.enum(EMAIL_KINDS, { message: `must be one of ${EMAIL_KINDS.join(', ')}` }).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export type MailListQuery = z.infer<typeof mailListQuerySchema>;

export const mailListSchema = z.object({
  items: z.array(mailItemSchema),
  total: z.number().int().nonnegative(),
  /** Where messages go, in words ("local mail catcher on 127.0.0.1:40125", "SMTP server …"). */
  transport: z.string().nullable(),
  /** True when messages stay on this machine (the local catcher). */
  local: z.boolean(),
  /** The plant's time zone, to show the times in. */
  zone: z.string(),
});
export type MailList = z.infer<typeof mailListSchema>;

export const mailParamsSchema = z.object({ id: idSchema });
