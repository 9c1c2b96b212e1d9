import { z } from 'zod';
import { BATCH_STATUSES, DRIVER_STATUSES } from '../constants';
import { CURE_METHODS } from '../cure-methods';
import { idSchema, instantSchema, listFormatSchema, paginationQuerySchema } from './common';
import { stepRunSchema } from './steps';
import { driverBatchSchema, driverSchema } from './drivers';

export const batchStatusSchema = z.enum(BATCH_STATUSES);

/** POST /api/batches (assembler, quality). */
export const batchInputSchema = z.object({
  modelId: idSchema,
  quantity: z.number().int('must be a whole number').min(1, 'must be at least 1').max(10000, 'is at most 10000'),
});
export type BatchInput = z.infer<typeof batchInputSchema>;

export const batchSchema = z.object({
  id: idSchema,
  /** Human-readable and scannable: <model code>-<yyMMdd>-<seq of the day, 2 digits>. */
  code: z.string(),
  modelId: idSchema,
  modelCode: z.string(),
  modelName: z.string(),
  /** The recipe revision the batch is built with (kept when a newer revision becomes current). */
  modelRevision: z.number().int().positive(),
  quantity: z.number().int(),
  status: batchStatusSchema,
  createdBy: idSchema.nullable(),
  createdAt: instantSchema,
  completedAt: instantSchema.nullable(),
});
export type Batch = z.infer<typeof batchSchema>;

export const batchDriverSchema = z.object({
  id: idSchema,
  /** <batch code>-<unit, 4 digits> */
  serial: z.string(),
  status: z.enum(DRIVER_STATUSES),
});
export type BatchDriver = z.infer<typeof batchDriverSchema>;

export const batchCreatedSchema = z.object({ batch: batchSchema, drivers: z.array(batchDriverSchema) });
export type BatchCreated = z.infer<typeof batchCreatedSchema>;

export const batchListQuerySchema = paginationQuerySchema.extend({
  status: batchStatusSchema.optional(),
  modelId: idSchema.optional(),
  /** Part of the batch code. */
  q: z.string().trim().min(1).max(60).optional(),
  createdFrom: instantSchema.optional(),
  createdTo: instantSchema.optional(),
  format: listFormatSchema,
});
export type BatchListQuery = z.infer<typeof batchListQuerySchema>;

export const batchPageSchema = z.object({ items: z.array(batchSchema), total: z.number().int().nonnegative() });
export type BatchPage = z.infer<typeof batchPageSchema>;

/**
 * Where a recipe step stands for the batch: pending (not started), running, curing (finished,
 * its adhesive not yet fully cured; computed from the area's readings) or done.
 */
export const STEP_STATES = ['pending', 'running', 'curing', 'done'] as const;
export const stepStateSchema = z.enum(STEP_STATES);
export type StepState = z.infer<typeof stepStateSchema>;

export const travelerMaterialSchema = z.object({
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  unit: z.string(),
  amountPerUnit: z.number(),
  /** One part of a two-part adhesive (it has a mix partner): the step's material is a mix. */
  twoPart: z.boolean(),
  /** How this material cures (null: no cure profile, not an adhesive that cures). */
  cureMethod: z.enum(CURE_METHODS).nullable().default(null),
});

/**
 * How a step's adhesives cure, from their data sheets: the method (UV before heat before
 * ambient when a step uses several), the UV dose needed, the oven schedule's range and the
 * humidity window of a moisture-curing adhesive.
 */
export const stepCureSchema = z.object({
  method: z.enum(CURE_METHODS),
  uvDoseMJcm2: z.number().nullable(),
  minTempC: z.number().nullable(),
  /** Heat: the schedule's points (temperature, minutes), coolest first. */
  schedule: z.array(z.object({ tempC: z.number(), minutes: z.number() })),
  rhMinPct: z.number().nullable(),
  rhMaxPct: z.number().nullable(),
});
export type StepCure = z.infer<typeof stepCureSchema>;

/** A finished run's cure against its adhesive's humidity window: `outside` lists the stretches out of it. */
export const stepHumiditySchema = z.object({
  rhMinPct: z.number().nullable(),
  rhMaxPct: z.number().nullable(),
  area: z.string(),
  outside: z.array(z.object({ from: instantSchema, to: instantSchema, rhPct: z.number() })),
});
export type StepHumidity = z.infer<typeof stepHumiditySchema>;

export const travelerStepSchema = z.object({
  id: idSchema,
  seq: z.number().int(),
  name: z.string(),
  stationKind: z.string(),
  waitForCure: z.boolean(),
  materials: z.array(travelerMaterialSchema),
  state: stepStateSchema,
  /** The whole-batch run of this step, when started. */
  run: stepRunSchema.nullable(),
  handlingAt: instantSchema.nullable(),
  /** Recomputed from the readings recorded since the finish. */
  cureCompleteAt: instantSchema.nullable(),
  /** How the step's adhesive cures (null when none of its materials has a cure profile). */
  cure: stepCureSchema.nullable().default(null),
  /** The finished run's humidity check (null: no adhesive of the run has a humidity window). */
  humidity: stepHumiditySchema.nullable().default(null),
});
export type TravelerStep = z.infer<typeof travelerStepSchema>;

/** GET /api/batches/:id — the traveler. */
export const batchDetailSchema = z.object({
  batch: batchSchema,
  steps: z.array(travelerStepSchema),
  /** The first step not yet finished (null when all are). */
  currentStepId: idSchema.nullable(),
  drivers: z.array(batchDriverSchema),
  /** Single-unit (rework) runs, oldest first. */
  reworkRuns: z.array(stepRunSchema),
});
export type BatchDetail = z.infer<typeof batchDetailSchema>;

/** POST /api/scans/resolve answer for a batch's code (the traveler label). */
export const batchScanResultSchema = z.object({
  type: z.literal('batch'),
  batch: batchSchema,
  /** The first step not yet finished, where the batch goes next (null when all are done). */
  currentStep: z.object({ id: idSchema, seq: z.number().int(), name: z.string(), stationKind: z.string() }).nullable(),
});
export type BatchScanResult = z.infer<typeof batchScanResultSchema>;

/** POST /api/scans/resolve answer for a driver's serial. */
export const driverScanResultSchema = z.object({ type: z.literal('driver'), driver: driverSchema, batch: driverBatchSchema });
export type DriverScanResult = z.infer<typeof driverScanResultSchema>;
