import { z } from 'zod';
import { STEP_RUN_KINDS } from '../constants';
import { idSchema, instantSchema } from './common';

const tempSchema = z.number().min(-60, 'must be at least -60 °C').max(300, 'must be at most 300 °C');

/**
 * POST /api/cure/estimate (signed in): a heat or ambient cure at one temperature or integrated over
 * readings (an oven's own for heat); a UV cure's exposure time from a lamp's irradiance.
 */
export const cureEstimateInputSchema = z
  .object({
    materialId: idSchema,
    startAt: instantSchema.optional(),
    tempC: tempSchema.optional(),
    readings: z
      .array(z.object({ at: instantSchema, tempC: tempSchema }))
      .min(1, 'needs at least one reading')
      .max(5000, 'has at most 5000 readings')
      .optional(),
    /** UV: the lamp's irradiance (radiometer reading), mW/cm². */
    irradianceMWcm2: z.number().gt(0, 'must be more than 0 mW/cm²').max(100000, 'must be at most 100,000 mW/cm²').optional(),
  })
  .superRefine((v, ctx) => {
    if (v.irradianceMWcm2 !== undefined) {
      if (v.tempC !== undefined) ctx.addIssue({ code: 'custom', path: ['tempC'], message: 'cannot be given with irradianceMWcm2' });
      if (v.readings) ctx.addIssue({ code: 'custom', path: ['readings'], message: 'cannot be given with irradianceMWcm2' });
      return;
    }
    if (v.startAt === undefined) ctx.addIssue({ code: 'custom', path: ['startAt'], message: 'is required' });
    if (v.tempC === undefined && !v.readings) ctx.addIssue({ code: 'custom', path: ['tempC'], message: 'or readings is required' });
    if (v.tempC !== undefined && v.readings) ctx.addIssue({ code: 'custom', path: ['readings'], message: 'cannot be given with tempC' });
  });
export type CureEstimateInput = z.infer<typeof cureEstimateInputSchema>;

/** A heat or ambient cure's times; null while no progress is made at the last temperature (below the minimum). */
export const cureTimeEstimateSchema = z.object({
  cureMethod: z.enum(['ambient', 'heat']),
  handlingAt: instantSchema.nullable(),
  fullCureAt: instantSchema.nullable(),
  /** Reference full-cure time ÷ the estimated one: 2 means twice as fast as at refTempC. */
  factor: z.number(),
  refTempC: z.number(),
  handlingMinutes: z.number().nullable(),
  fullCureMinutes: z.number().nullable(),
  /** Minutes spent below the material's minimum cure temperature before full cure. */
  minutesBelowMin: z.number(),
  /** 'arrhenius' when the material gives an activation energy, else the factor-per-10 °C rule. */
  method: z.enum(['arrhenius', 'factor_per_10c']),
});

/** A UV cure: exposure = dose ÷ irradiance. */
export const uvEstimateSchema = z.object({
  cureMethod: z.literal('uv'),
  exposureSeconds: z.number(),
  doseMJcm2: z.number(),
  irradianceMWcm2: z.number(),
});

export const cureEstimateSchema = z.union([cureTimeEstimateSchema, uvEstimateSchema]);
export type CureEstimate = z.infer<typeof cureEstimateSchema>;

/** One finished step run whose adhesive cure Tacklog is timing. */
export const cureItemSchema = z.object({
  stepRunId: idSchema,
  batchId: idSchema,
  batchCode: z.string(),
  modelCode: z.string(),
  stepId: idSchema,
  stepName: z.string(),
  seq: z.number().int(),
  kind: z.enum(STEP_RUN_KINDS),
  serial: z.string().nullable(),
  waitForCure: z.boolean(),
  stationId: idSchema,
  stationCode: z.string(),
  area: z.string(),
  finishedAt: instantSchema,
  /** Recomputed from the readings recorded since the finish (last known temperature holds). */
  /** null while the cure makes no progress at the temperature recorded */
  handlingAt: instantSchema.nullable(),
  cureCompleteAt: instantSchema.nullable(),
  /** 'own': cured at the station's own readings (an oven); 'area': the area's air. */
  cureEnvironment: z.enum(['area', 'own']),
  /** 0..1 of the full cure, now. */
  progress: z.number(),
  /** How the run's adhesive cures (UV before heat before ambient when several). */
  cureMethod: z.enum(['ambient', 'heat', 'uv']).nullable().default(null),
  /** A UV run's dose at its finish. */
  uv: z
    .object({ exposureSeconds: z.number(), irradianceMWcm2: z.number(), doseMJcm2: z.number(), neededMJcm2: z.number() })
    .nullable()
    .default(null),
  ready: z.boolean(),
  /** The step that waits for this cure (null after the last step). */
  nextStep: z.object({ id: idSchema, seq: z.number().int(), name: z.string() }).nullable(),
});
export type CureItem = z.infer<typeof cureItemSchema>;

/** GET /api/batches/:id/cure and GET /api/cure/board. */
export const cureListSchema = z.object({ items: z.array(cureItemSchema), now: instantSchema });
export type CureList = z.infer<typeof cureListSchema>;

export const cureBoardQuerySchema = z.object({
  /** Only stations in this shop area. */
  area: z.string().trim().min(1).optional(),
});
