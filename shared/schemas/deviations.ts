import { z } from 'zod';
import { idSchema, instantSchema } from './common';

/**
 * Rules a deviation may set aside. early_start: start a step before the previous step's cure is
 * complete; uv_dose_low: finish a UV step whose dose fell short of the adhesive's.
 */
export const DEVIATION_KINDS = ['early_start', 'uv_dose_low'] as const;

/** POST /api/deviations (quality): a signed decision to go on despite a rule. */
export const deviationInputSchema = z.object({
  batchId: idSchema,
  stepId: idSchema,
  kind: z.enum(DEVIATION_KINDS),
  reason: z.string().trim().min(5, 'needs at least 5 characters').max(1000, 'is at most 1000 characters'),
});
export type DeviationInput = z.infer<typeof deviationInputSchema>;

export const deviationSchema = z.object({
  id: idSchema,
  kind: z.string(),
  batchId: idSchema.nullable(),
  stepId: idSchema.nullable(),
  reason: z.string(),
  /** Signature (21 CFR 11.50): who, when, and what it means. */
  meaning: z.string(),
  signedBy: idSchema,
  signedByName: z.string(),
  signedAt: instantSchema,
  /** When a step start used it (null while unused). */
  usedAt: instantSchema.nullable(),
});
export type Deviation = z.infer<typeof deviationSchema>;

export const deviationResultSchema = z.object({ deviation: deviationSchema });
export const deviationListQuerySchema = z.object({ batchId: idSchema.optional(), stepId: idSchema.optional() });
export const deviationListSchema = z.object({ items: z.array(deviationSchema) });
