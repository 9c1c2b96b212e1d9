import { z } from 'zod';
import { dateSchema, idSchema, instantSchema, listFormatSchema } from './common';

/** GET /api/audit filters; every one optional. `from`/`to` are plant dates or instants. */
export const auditQuerySchema = z.object({
  entity: z.string().trim().min(1).max(60).optional(),
  entityId: z.string().trim().min(1).max(200).optional(),
  actor: idSchema.optional(),
  action: z.string().trim().min(1).max(80).optional(),
  from: z.union([dateSchema, instantSchema]).optional(),
  to: z.union([dateSchema, instantSchema]).optional(),
  /** Continue after this row id (the previous page's nextCursor). */
  cursor: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  format: listFormatSchema,
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditActorSchema = z.object({ id: idSchema, name: z.string(), email: z.string() }).nullable();

export const auditItemSchema = z.object({
  id: z.number().int(),
  at: instantSchema,
  actor: auditActorSchema,
  action: z.string(),
  entity: z.string(),
  entityId: z.string(),
  before: z.unknown().nullable(),
  after: z.unknown().nullable(),
  reason: z.string().nullable(),
  prevHash: z.string().nullable(),
  hash: z.string().nullable(),
});
export type AuditItem = z.infer<typeof auditItemSchema>;

export const auditPageSchema = z.object({ items: z.array(auditItemSchema), nextCursor: z.number().int().nullable() });
export type AuditPage = z.infer<typeof auditPageSchema>;

export const auditVerifyResultSchema = z.object({
  ok: z.boolean(),
  checked: z.number().int().nonnegative(),
  firstBroken: z.object({ id: z.number().int(), at: instantSchema, problem: z.string() }).nullable(),
});
export type AuditVerifyResult = z.infer<typeof auditVerifyResultSchema>;
