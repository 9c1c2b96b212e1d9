import { z } from 'zod';
import { LOT_STATUSES, MATERIAL_KINDS, STEP_RUN_KINDS } from '../constants';
import { idSchema, instantSchema } from './common';
import { driverBatchSchema, driverSchema } from './drivers';
import { driverStatusSchema, testRecordSchema } from './tests';

export const lotTraceParamsSchema = z.object({ id: idSchema });

/** The two-part mix a material reached the step through (absent when loaded directly). */
export const traceViaMixSchema = z.object({
  mixId: idSchema,
  mixCode: z.string(),
  mixedAt: instantSchema,
  /** Which part of the mix this container gave. */
  part: z.enum(['resin', 'hardener']),
});
export type TraceViaMix = z.infer<typeof traceViaMixSchema>;

/** One container (and so one lot) used by a step run. */
export const traceMaterialSchema = z.object({
  containerId: idSchema,
  containerCode: z.string(),
  lotId: idSchema,
  supplierLot: z.string(),
  lotStatus: z.enum(LOT_STATUSES),
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  materialKind: z.enum(MATERIAL_KINDS),
  supplierId: idSchema,
  supplierName: z.string(),
  certificateId: idSchema.nullable(),
  /** Quantity recorded on the step run (for a mix: of the mix). */
  quantityUsed: z.number(),
  via: traceViaMixSchema.optional(),
});
export type TraceMaterial = z.infer<typeof traceMaterialSchema>;

export const traceStepSchema = z.object({
  stepRunId: idSchema,
  stepId: idSchema,
  stepName: z.string(),
  seq: z.number().int(),
  kind: z.enum(STEP_RUN_KINDS),
  /** Set for a single-unit run (rework of this driver). */
  driverId: idSchema.nullable(),
  stationId: idSchema,
  stationCode: z.string(),
  stationName: z.string(),
  startedAt: instantSchema,
  finishedAt: instantSchema.nullable(),
  shortCure: z.boolean(),
  deviationId: idSchema.nullable(),
  materials: z.array(traceMaterialSchema),
});
export type TraceStep = z.infer<typeof traceStepSchema>;

/**
 * GET /api/drivers/:serial/trace — backward genealogy: the batch's whole-batch runs and this
 * driver's own rework runs (whole-batch runs first, then rework runs, each by start time).
 */
export const driverTraceSchema = z.object({
  driver: driverSchema,
  batch: driverBatchSchema,
  steps: z.array(traceStepSchema),
  tests: z.array(testRecordSchema),
});
export type DriverTrace = z.infer<typeof driverTraceSchema>;

export const traceLotSchema = z.object({
  id: idSchema,
  supplierLot: z.string(),
  status: z.enum(LOT_STATUSES),
  receivedAt: instantSchema,
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  supplierId: idSchema,
  supplierName: z.string(),
  certificateId: idSchema.nullable(),
});
export type TraceLot = z.infer<typeof traceLotSchema>;

/** One use of the lot: a container of it (directly or in a mix) on a step run. */
export const lotUseSchema = z.object({
  stepRunId: idSchema,
  kind: z.enum(STEP_RUN_KINDS),
  batchId: idSchema,
  /** Set when the run was on one driver only (rework): then only that driver is reached. */
  driverSerial: z.string().nullable(),
  stepId: idSchema,
  stepName: z.string(),
  seq: z.number().int(),
  stationCode: z.string(),
  startedAt: instantSchema,
  finishedAt: instantSchema.nullable(),
  containerCode: z.string(),
  mixCode: z.string().nullable(),
});
export type LotUse = z.infer<typeof lotUseSchema>;

export const traceBatchSchema = z.object({
  id: idSchema,
  code: z.string(),
  modelId: idSchema,
  modelCode: z.string(),
  modelName: z.string(),
  /** The recipe revision the batch was built with. */
  modelRevision: z.number().int().positive(),
  createdAt: instantSchema,
  /** A whole-batch run used the lot (every driver of the batch is reached). */
  wholeBatch: z.boolean(),
  /** Drivers of this batch reached by the lot. */
  driverCount: z.number().int(),
});
export type TraceBatch = z.infer<typeof traceBatchSchema>;

export const traceDriverSchema = z.object({
  serial: z.string(),
  status: driverStatusSchema,
  batchId: idSchema,
});
export type TraceDriver = z.infer<typeof traceDriverSchema>;

export const driverStatusCountsSchema = z.object({
  total: z.number().int(),
  in_process: z.number().int(),
  passed: z.number().int(),
  failed: z.number().int(),
  reworked: z.number().int(),
  scrapped: z.number().int(),
});
export type DriverStatusCounts = z.infer<typeof driverStatusCountsSchema>;

/** GET /api/lots/:id/trace — forward genealogy (the containment list). */
export const lotTraceSchema = z.object({
  lot: traceLotSchema,
  uses: z.array(lotUseSchema),
  batches: z.array(traceBatchSchema),
  drivers: z.array(traceDriverSchema),
  counts: driverStatusCountsSchema,
});
export type LotTrace = z.infer<typeof lotTraceSchema>;

/** Columns of GET /api/lots/:id/trace.csv, in order. */
export const CONTAINMENT_CSV_COLUMNS = [
  'serial',
  'status',
  'batch_code',
  'model',
  'step',
  'station',
  'finished_at',
  'container_code',
  'mix_code',
] as const;

/** GET /api/lots/stats — which lots' drivers fail final test more than the baseline explains. */
export const lotStatsQuerySchema = z.object({
  /** Lots received in the last `days` days (the family the many-lots correction runs over). */
  days: z.coerce.number().int('must be a whole number').min(1, 'must be at least 1').max(3660, 'is at most 3660').default(90),
  materialId: idSchema.optional(),
  /** `true` lists only flagged lots (the correction still runs over every lot in the window). */
  flaggedOnly: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
});
export type LotStatsQuery = z.infer<typeof lotStatsQuerySchema>;

export const lotStatSchema = z.object({
  lotId: idSchema,
  supplierLot: z.string(),
  status: z.enum(LOT_STATUSES),
  receivedAt: instantSchema,
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  /** Drivers built in whole-batch runs that used the lot (rework uses come after a failure). */
  driversBuilt: z.number().int(),
  /** Of those, drivers with a final test, and drivers that failed one. */
  tested: z.number().int(),
  failures: z.number().int(),
  failureRate: z.number().nullable(),
  /** Exact one-sided binomial test against the baseline, and its Benjamini–Hochberg q-value. */
  pValue: z.number(),
  qValue: z.number(),
  /** Above the p-chart upper control limit for its sample size. */
  aboveUcl: z.boolean(),
  flagged: z.boolean(),
});
export type LotStat = z.infer<typeof lotStatSchema>;

export const lotStatsSchema = z.object({
  baseline: z.number(),
  q: z.number(),
  days: z.number().int(),
  items: z.array(lotStatSchema),
});
export type LotStats = z.infer<typeof lotStatsSchema>;
