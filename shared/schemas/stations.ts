import { z } from 'zod';
import { idSchema, instantSchema } from './common';

export const CURE_ENVIRONMENTS = ['area', 'own'] as const;
export type CureEnvironment = (typeof CURE_ENVIRONMENTS)[number];
const cureEnvironmentSchema = z.enum(CURE_ENVIRONMENTS, {
  error: "must be 'area' (the area's air) or 'own' (an oven or UV lamp with its own readings)",
});

const text = (max: number) => z.string().trim().min(1, 'is required').max(max, `is at most ${max} characters`);

/** Station codes are scanned: letters, digits and - _ . only. */
export const stationCodeSchema = z
  .string()
  .trim()
  .min(1, 'is required')
  .max(40, 'is at most 40 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'may hold letters, digits, dot, dash and underscore only');

export const stationSchema = z.object({
  id: idSchema,
  code: z.string(),
  name: z.string(),
  /** What the station does; recipe steps name the kind they run at (free text, e.g. "dust-cap glue"). */
  kind: z.string(),
  /** Shop area; temperature readings are kept per area. */
  area: z.string(),
  /** 'area': cures in the area's air; 'own': an oven or UV lamp with its own readings. */
  cureEnvironment: z.enum(CURE_ENVIRONMENTS),
  active: z.boolean(),
  createdAt: instantSchema,
});
export type Station = z.infer<typeof stationSchema>;

/** POST /api/stations (admin). */
export const stationInputSchema = z.object({
  code: stationCodeSchema,
  name: text(120),
  kind: text(80),
  area: text(80),
  cureEnvironment: cureEnvironmentSchema.default('area'),
});
export type StationInput = z.infer<typeof stationInputSchema>;

/** PATCH /api/stations/:id (admin): any of the fields; `active: true` brings a retired station back. */
export const stationPatchSchema = z
  .object({
    code: stationCodeSchema.optional(),
    name: text(120).optional(),
    kind: text(80).optional(),
    area: text(80).optional(),
    cureEnvironment: cureEnvironmentSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'names no field to change' });
export type StationPatch = z.infer<typeof stationPatchSchema>;

export const stationListQuerySchema = z.object({
  /** Also list retired stations. */
  includeRetired: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
  kind: z.string().trim().min(1).optional(),
  area: z.string().trim().min(1).optional(),
});
export type StationListQuery = z.infer<typeof stationListQuerySchema>;

export const stationListSchema = z.object({ items: z.array(stationSchema) });
export type StationList = z.infer<typeof stationListSchema>;

export const idParamsSchema = z.object({ id: idSchema });

/** POST /api/scans/resolve answer for a station's code. */
export const stationScanResultSchema = z.object({ type: z.literal('station'), station: stationSchema });
export type StationScanResult = z.infer<typeof stationScanResultSchema>;
