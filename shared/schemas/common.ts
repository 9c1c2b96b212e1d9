import { z } from 'zod';

/** Ids are strings (UUIDs in this database). */
export const idSchema = z.string().uuid({ message: 'must be an id (UUID)' });

/** ISO 8601 timestamp with offset, e.g. 2026-03-04T15:30:00.000Z. */
export const instantSchema = z.string().datetime({ offset: true, message: 'must be an ISO 8601 timestamp with offset' });

/** Calendar date YYYY-MM-DD. */
export const dateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date as YYYY-MM-DD', abort: true })
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, 'is not a real calendar date');

/** `?format=csv` on a list route: the same filtered rows as a CSV download (every matching row, not one page). */
export const listFormatSchema = z.enum(['json', 'csv'], { message: 'must be json or csv' }).default('json');

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

/**
 * Decimal places of a number as written in JSON (its shortest round-trip form): 0.125 → 3,
 * 1e-10 → 10, 2.5e3 → 0. Quantities are stored as numeric(p, s); a value with more places than
 * the column keeps would be rounded by PostgreSQL (to 0 for 1e-10), so the schemas refuse it.
 */
export function decimalPlaces(n: number): number {
  if (!Number.isFinite(n)) return Infinity;
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(String(Math.abs(n)));
  if (!m) return Infinity;
  const fraction = m[2]?.length ?? 0;
  const exponent = m[3] ? Number(m[3]) : 0;
  return Math.max(0, fraction - exponent);
}

/**
 * A number for a numeric(precision, scale) column: at most `scale` decimal places and below
 * 10^(precision − scale), so PostgreSQL neither rounds it away nor overflows. Chain `.positive()`,
 * `.max()` etc. before passing the schema in.
 */
export function fitsColumn<S extends z.ZodNumber>(schema: S, column: { precision: number; scale: number }): S {
  const limit = 10 ** (column.precision - column.scale);
  return schema
    .refine((n) => Math.abs(n) < limit, `must be less than ${limit.toLocaleString('en')}`)
    .refine((n) => decimalPlaces(n) <= column.scale, `may have at most ${column.scale} decimal places`) as S;
}

/** numeric(14, 3): container, mix and consumed quantities; reorder point and order quantity. */
export const QUANTITY_COLUMN = { precision: 14, scale: 3 } as const;
/** numeric(14, 4): recipe amount per unit. */
export const AMOUNT_PER_UNIT_COLUMN = { precision: 14, scale: 4 } as const;
/** numeric(12, 4): a two-part material's mix ratio. */
export const MIX_RATIO_COLUMN = { precision: 12, scale: 4 } as const;
/** numeric(5, 2): temperature and relative humidity readings. */
export const READING_COLUMN = { precision: 5, scale: 2 } as const;

/**
 * The first text anywhere in `value` (object, array, string) that holds a NUL character, as a
 * field path like `containers.0.code`; null when there is none. PostgreSQL cannot store NUL in
 * text, so every input is checked for it before it reaches a schema.
 */
export function findNulField(value: unknown, path: string[] = [], depth = 0): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') : null;
  if (depth > 32 || value === null || typeof value !== 'object') return null;
  for (const [key, inner] of Object.entries(value as Record<string, unknown>)) {
    if (key.includes('\u0000')) return [...path, key.split('\u0000').join('\\0')].join('.');
    const found = findNulField(inner, [...path, key], depth + 1);
    if (found !== null) return found;
  }
  return null;
}
