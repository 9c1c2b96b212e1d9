import { z } from 'zod';
import { fitsColumn, idSchema, instantSchema, listFormatSchema, READING_COLUMN } from './common';

/** A reading may be stamped at most this far ahead of the server's clock (clock drift). */
export const READING_MAX_FUTURE_MS = 5 * 60 * 1000;

const areaSchema = z.string().trim().min(1, 'is required').max(80, 'is at most 80 characters');
const atSchema = instantSchema.refine(
  // (a malformed instant is reported once, by instantSchema)
  (s) => Number.isNaN(Date.parse(s)) || Date.parse(s) <= Date.now() + READING_MAX_FUTURE_MS,
  'is in the future (more than 5 minutes ahead of the server clock)',
);
const tempSchema = fitsColumn(z.number().min(-60, 'must be at least -60 °C').max(400, 'must be at most 400 °C'), READING_COLUMN);
const irradianceSchema = fitsColumn(
  z.number().min(0, 'must not be negative').max(100000, 'must be at most 100,000 mW/cm²'),
  READING_COLUMN,
);
/** An area's air is read up to 150 °C; an oven's own readings up to 400 °C. */
const AREA_MAX_TEMP_C = 150;

type PlaceFields = { area?: string | null; stationId?: string | null; tempC?: number | null; irradianceMWcm2?: number | null };
/** Exactly one of area / stationId; a temperature, or (a station's radiometer reading) an irradiance. */
function checkPlace(v: PlaceFields, ctx: z.RefinementCtx, prefix: (string | number)[] = []): void {
  const hasArea = v.area !== undefined && v.area !== null;
  const hasStation = v.stationId !== undefined && v.stationId !== null;
  if (hasArea && hasStation)
    ctx.addIssue({ code: 'custom', path: [...prefix, 'stationId'], message: 'give either area or stationId, not both' });
  if (!hasArea && !hasStation)
    ctx.addIssue({ code: 'custom', path: [...prefix, 'area'], message: "is required (or stationId for a station's own reading)" });
  const hasTemp = v.tempC !== undefined && v.tempC !== null;
  const hasIrr = v.irradianceMWcm2 !== undefined && v.irradianceMWcm2 !== null;
  if (!hasTemp && !(hasStation && hasIrr)) ctx.addIssue({ code: 'custom', path: [...prefix, 'tempC'], message: 'is required' });
  if (hasIrr && !hasStation)
    ctx.addIssue({ code: 'custom', path: [...prefix, 'irradianceMWcm2'], message: 'is a UV lamp reading: give stationId, not area' });
  if (hasArea && hasTemp && (v.tempC as number) > AREA_MAX_TEMP_C)
    ctx.addIssue({ code: 'custom', path: [...prefix, 'tempC'], message: `must be at most ${AREA_MAX_TEMP_C} °C for an area` });
}
const rhSchema = fitsColumn(z.number().min(0, 'must be at least 0 %').max(100, 'must be at most 100 %'), READING_COLUMN);
const sourceSchema = z.string().trim().min(1).max(60);

/** One shop-condition reading for an area. */
export const readingInputSchema = z
  .object({
    area: areaSchema.nullish(),
    /** A station's own reading (an oven, a UV lamp) in place of an area's. */
    stationId: idSchema.nullish(),
    at: atSchema,
    tempC: tempSchema.nullish(),
    rhPct: rhSchema.nullish(),
    /** A UV lamp's radiometer reading, mW/cm². */
    irradianceMWcm2: irradianceSchema.nullish(),
    /** 'manual' by default; scripts may name their logger. */
    source: sourceSchema.optional(),
  })
  .superRefine((v, ctx) => checkPlace(v, ctx));
export type ReadingInput = z.infer<typeof readingInputSchema>;

/**
 * POST /api/readings (assembler, quality, admin): one reading `{area, at, tempC, rhPct?}`,
 * or many `{readings: [...]}` (scripts, loggers). Parsed to a list either way.
 */
export const readingsPostSchema = z
  .object({
    readings: z.array(readingInputSchema).min(1, 'needs at least one reading').max(1000, 'has at most 1000 readings').optional(),
    area: areaSchema.nullish(),
    stationId: idSchema.nullish(),
    at: atSchema.optional(),
    tempC: tempSchema.nullish(),
    rhPct: rhSchema.nullish(),
    irradianceMWcm2: irradianceSchema.nullish(),
    source: sourceSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.readings) return;
    if (v.at === undefined) ctx.addIssue({ code: 'custom', path: ['at'], message: 'is required' });
    checkPlace(v, ctx);
  })
  .transform((v) => ({
    single: !v.readings,
    items: (v.readings ?? [
      {
        area: v.area,
        stationId: v.stationId,
        at: v.at as string,
        tempC: v.tempC,
        rhPct: v.rhPct,
        irradianceMWcm2: v.irradianceMWcm2,
        source: v.source,
      },
    ]) as ReadingInput[],
  }));
export type ReadingsPost = z.infer<typeof readingsPostSchema>;

export const readingSchema = z.object({
  id: idSchema,
  /** Null for a station's own reading. */
  area: z.string().nullable(),
  stationId: idSchema.nullable(),
  at: instantSchema,
  /** Null only for a radiometer reading without a temperature. */
  tempC: z.number().nullable(),
  rhPct: z.number().nullable(),
  irradianceMWcm2: z.number().nullable(),
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
    stationId: idSchema.optional(),
    /** Only readings carrying this measure (a UV lamp's radiometer readings: 'irradiance'). */
    measure: z.enum(['temperature', 'irradiance'], { error: "must be 'temperature' or 'irradiance'" }).optional(),
    from: instantSchema.optional(),
    to: instantSchema.optional(),
    limit: z.coerce.number().int().min(1).max(5000).default(500),
    format: listFormatSchema,
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) <= Date.parse(q.to), { path: ['to'], message: 'is before from' });
export type ReadingQuery = z.infer<typeof readingQuerySchema>;

/** GET /api/readings: newest first. */
export const readingPageSchema = z.object({ items: z.array(readingSchema) });
