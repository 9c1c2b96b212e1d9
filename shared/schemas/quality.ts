import { z } from 'zod';
import { dateSchema, idSchema, instantSchema } from './common';

export const qualityOverviewQuerySchema = z
  .object({
    /** Plant dates; default the last 12 weeks. */
    from: dateSchema.optional(),
    to: dateSchema.optional(),
    modelId: idSchema.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: 'must not be after "to"', path: ['from'] });
export type QualityOverviewQuery = z.infer<typeof qualityOverviewQuerySchema>;

export const baselineSchema = z.object({
  /** Plant failure rate at final test the lots are judged against. */
  rate: z.number(),
  /** Drivers tested and failed in the baseline window (what `rate` is computed from unless overridden). */
  tested: z.number().int(),
  failed: z.number().int(),
  from: instantSchema,
  to: instantSchema,
  overridden: z.boolean(),
  /** When overridden: why, by whom, when. */
  override: z.object({ rate: z.number(), reason: z.string(), by: z.string(), at: instantSchema }).nullable(),
  /** 'override' | 'window' | 'default' (too few tests in the window: the plant default). */
  source: z.enum(['override', 'window', 'default']),
});
export type Baseline = z.infer<typeof baselineSchema>;

export const pChartPointSchema = z.object({
  lotId: idSchema,
  lotLabel: z.string(),
  materialId: idSchema,
  materialName: z.string(),
  lotStatus: z.string(),
  tested: z.number().int(),
  failed: z.number().int(),
  p: z.number(),
  centre: z.number(),
  ucl: z.number(),
  lcl: z.number(),
  pValue: z.number(),
  qValue: z.number(),
  flagged: z.boolean(),
});

export const paretoBarSchema = z.object({
  defectCode: z.string(),
  description: z.string(),
  count: z.number().int(),
  cumulativePct: z.number(),
});

export const fpyRowSchema = z.object({
  modelId: idSchema,
  modelCode: z.string(),
  /** Monday of the plant week, YYYY-MM-DD. */
  week: dateSchema,
  built: z.number().int(),
  passedFirstTime: z.number().int(),
  fpy: z.number().nullable(),
});

export const qualityOverviewSchema = z.object({
  from: dateSchema,
  to: dateSchema,
  baseline: baselineSchema,
  pChart: z.array(pChartPointSchema),
  pareto: z.array(paretoBarSchema),
  firstPassYield: z.array(fpyRowSchema),
  shortCures: z.array(
    z.object({
      stepRunId: idSchema,
      batchId: idSchema,
      batchCode: z.string(),
      step: z.string(),
      startedAt: instantSchema,
      deviation: z.string().nullable(),
    }),
  ),
  openDeviations: z.array(
    z.object({
      id: idSchema,
      kind: z.string(),
      batchCode: z.string().nullable(),
      reason: z.string(),
      signedBy: z.string(),
      signedAt: instantSchema,
    }),
  ),
  lotsAwaitingInspection: z.array(
    z.object({ lotId: idSchema, supplierLot: z.string(), materialName: z.string(), receivedAt: instantSchema, ageHours: z.number() }),
  ),
});
export type QualityOverview = z.infer<typeof qualityOverviewSchema>;

/** POST /api/quality/baseline: a rate with a reason, or `rate: null` to go back to the computed one. */
export const baselineOverrideInputSchema = z.object({
  rate: z.number().gt(0, 'must be above 0').lt(1, 'must be below 1 (a fraction: 0.012 is 1.2 %)').nullable(),
  reason: z.string().trim().min(10, 'must say why in at least 10 characters').max(500),
});
export type BaselineOverrideInput = z.infer<typeof baselineOverrideInputSchema>;
