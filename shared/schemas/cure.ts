import { z } from 'zod';
import { STEP_RUN_KINDS } from '../constants';
import { idSchema, instantSchema } from './common';

const tempSchema = z.number().min(-60, 'must be at least -60 °C').max(150, 'must be at most 150 °C');

/** POST /api/cure/estimate (signed in): at one temperature, or integrated over readings. */
export const cureEstimateInputSchema = z
  .object({
    materialId: idSchema,
    startAt: instantSchema,
    tempC: tempSchema.optional(),
    readings: z
      .array(z.object({ at: instantSchema, tempC: tempSchema }))
      .min(1, 'needs at least one reading')
      .max(5000, 'has at most 5000 readings')
      .optional(),
  })
  .superRefine((v, ctx) => {
    if (v.tempC === undefined && !v.readings) ctx.addIssue({ code: 'custom', path: ['tempC'], message: 'or readings is required' });
    if (v.tempC !== undefined && v.readings) ctx.addIssue({ code: 'custom', path: ['readings'], message: 'cannot be given with tempC' });
  });
export type CureEstimateInput = z.infer<typeof cureEstimateInputSchema>;

export const cureEstimateSchema = z.object({
  handlingAt: instantSchema,
  fullCureAt: instantSchema,
  /** Reference full-cure time ÷ the estimated one: 2 means twice as fast as at refTempC. */
  factor: z.number(),
  refTempC: z.number(),
  handlingMinutes: z.number(),
  fullCureMinutes: z.number(),
  /** 'arrhenius' when the material gives an activation energy, else the factor-per-10 °C rule. */
  method: z.enum(['arrhenius', 'factor_per_10c']),
});
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
  handlingAt: instantSchema,
  cureCompleteAt: instantSchema,
  /** 0..1 of the full cure, now. */
  progress: z.number(),
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
