import { z } from 'zod';

/** Ids are strings (UUIDs in this database). */
export const idSchema = z.string().uuid({ message: 'must be an id (UUID)' });

/** ISO 8601 timestamp with offset, e.g. 2026-03-04T15:30:00.000Z. */
export const instantSchema = z.string().datetime({ offset: true, message: 'must be an ISO 8601 timestamp with offset' });

/** Calendar date YYYY-MM-DD. */
export const dateSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date as YYYY-MM-DD', abort: true }).refine((s) => {
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}, 'is not a real calendar date');

export const paginationQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const errorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** One field problem in a 400 response's `details`. */
export const fieldIssueSchema = z.object({ field: z.string(), message: z.string() });
export type FieldIssue = z.infer<typeof fieldIssueSchema>;

export function listOf<T extends z.ZodTypeAny>(item: T) {
  return z.object({ items: z.array(item) });
}

export function pageOf<T extends z.ZodTypeAny>(item: T) {
  return z.object({ items: z.array(item), total: z.number().int().nonnegative() });
}
