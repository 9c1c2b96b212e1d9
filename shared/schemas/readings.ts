import { z } from 'zod';
import { fitsColumn, idSchema, instantSchema, READING_COLUMN } from './common';

/** A reading may be stamped at most this far ahead of the server's clock (clock drift). */
export const READING_MAX_FUTURE_MS = 5 * 60 * 1000;

const areaSchema = z.string().trim().min(1, 'is required').max(80, 'is at most 80 characters');
const atSchema = instantSchema.refine(
  // (a malformed instant is reported once, by instantSchema)
  (s) => Number.isNaN(Date.parse(s)) || Date.parse(s) <= Date.now() + READING_MAX_FUTURE_MS,
  'is in the future (more than 5 minutes ahead of the server clock)',
);
const tempSchema = fitsColumn(z.number().min(-60, 'must be at least -60 °C').max(150, 'must be at most 150 °C'), READING_COLUMN);
const rhSchema = fitsColumn(z.number().min(0, 'must be at least 0 %').max(100, 'must be at most 100 %'), READING_COLUMN);
const sourceSchema = z.string().trim().min(1).max(60);

/** One shop-condition reading for an area. */
export const readingInputSchema = z.object({
  area: areaSchema,
  at: atSchema,
  tempC: tempSchema,
  rhPct: rhSchema.nullish(),
  /** 'manual' by default; scripts may name their logger. */
  source: sourceSchema.optional(),
});
export type ReadingInput = z.infer<typeof readingInputSchema>;

/**
 * POST /api/readings (assembler, quality, admin): one reading `{area, at, tempC, rhPct?}`,
 * or many `{readings: [...]}` (scripts, loggers). Parsed to a list either way.
 */
export const readingsPostSchema = z
  .object({
    readings: z.array(readingInputSchema).min(1, 'needs at least one reading').max(1000, 'has at most 1000 readings').optional(),
    area: areaSchema.optional(),
    at: atSchema.optional(),
    tempC: tempSchema.optional(),
    rhPct: rhSchema.nullish(),
    source: sourceSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.readings) return;
    for (const field of ['area', 'at', 'tempC'] as const) {
      if (v[field] === undefined) ctx.addIssue({ code: 'custom', path: [field], message: 'is required' });
    }
  })
  .transform((v) => ({
    single: !v.readings,
    items: (v.readings ?? [
      { area: v.area as string, at: v.at as string, tempC: v.tempC as number, rhPct: v.rhPct, source: v.source },
    ]) as ReadingInput[],
  }));
export type ReadingsPost = z.infer<typeof readingsPostSchema>;

export const readingSchema = z.object({
  id: idSchema,
  area: z.string(),
  at: instantSchema,
  tempC: z.number(),
  rhPct: z.number().nullable(),
  source: z.string(),
  recordedBy: idSchema.nullable(),
  createdAt: instantSchema,
});
export type Reading = z.infer<typeof readingSchema>;

/** 201 answer to an array body. (A single reading answers with the Reading itself.) */
export const readingListSchema = z.object({ items: z.array(readingSchema) });

export const readingQuerySchema = z
  .object({
    area: areaSchema.optional(),
    from: instantSchema.optional(),
    to: instantSchema.optional(),
    limit: z.coerce.number().int().min(1).max(5000).default(500),
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) <= Date.parse(q.to), { path: ['to'], message: 'is before from' });
export type ReadingQuery = z.infer<typeof readingQuerySchema>;

/** GET /api/readings: newest first. */
export const readingPageSchema = z.object({ items: z.array(readingSchema) });
