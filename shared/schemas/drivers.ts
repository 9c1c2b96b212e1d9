import { z } from 'zod';
import { BATCH_STATUSES, STEP_RUN_KINDS } from '../constants';
import { idSchema, instantSchema } from './common';
import { driverStatusSchema, serialSchema, testRecordSchema } from './tests';
import { stepRunSchema } from './steps';

export { serialSchema, driverStatusSchema };

export const serialParamsSchema = z.object({ serial: serialSchema });

export const driverSchema = z.object({
  id: idSchema,
  serial: z.string(),
  batchId: idSchema,
  status: driverStatusSchema,
  createdAt: instantSchema,
});
export type Driver = z.infer<typeof driverSchema>;

export const driverBatchSchema = z.object({
  id: idSchema,
  code: z.string(),
  status: z.enum(BATCH_STATUSES),
  quantity: z.number().int(),
  modelId: idSchema,
  modelCode: z.string(),
  modelName: z.string(),
  /** The recipe revision the batch was built with. */
  modelRevision: z.number().int().positive(),
  createdAt: instantSchema,
});
export type DriverBatch = z.infer<typeof driverBatchSchema>;

/** A single-unit run on this driver (rework), newest last. */
export const driverRunSchema = z.object({
  stepRunId: idSchema,
  stepId: idSchema,
  stepName: z.string(),
  seq: z.number().int(),
  kind: z.enum(STEP_RUN_KINDS),
  stationId: idSchema,
  stationCode: z.string(),
  startedAt: instantSchema,
  finishedAt: instantSchema.nullable(),
});
export type DriverRun = z.infer<typeof driverRunSchema>;

/** GET /api/drivers/:serial */
export const driverDetailSchema = z.object({
  driver: driverSchema,
  batch: driverBatchSchema,
  model: z.object({ id: idSchema, code: z.string(), name: z.string() }),
  tests: z.array(testRecordSchema),
  reworkRuns: z.array(driverRunSchema),
});
export type DriverDetail = z.infer<typeof driverDetailSchema>;

/**
 * POST /api/drivers/:serial/rework/start and …/finish: one recipe step redone on this unit alone
 * at a station, with the materials loaded there for the driver's batch. Only a failed driver (or
 * one reworked and not yet re-tested) can be reworked.
 */
export const reworkInputSchema = z.object({
  stationId: idSchema,
  stepId: idSchema,
});
export type ReworkInput = z.infer<typeof reworkInputSchema>;

/** The driver after the action and the single-unit run (the steps module's StepRun shape). */
export const reworkResultSchema = z.object({
  driver: driverSchema,
  stepRun: stepRunSchema,
});
export type ReworkResult = z.infer<typeof reworkResultSchema>;

/** POST /api/drivers/:serial/scrap (quality). */
export const scrapInputSchema = z.object({
  reason: z.string().trim().min(5, 'is at least 5 characters').max(500, 'is at most 500 characters'),
});
export type ScrapInput = z.infer<typeof scrapInputSchema>;

export const driverResultSchema = z.object({ driver: driverSchema });
export type DriverResult = z.infer<typeof driverResultSchema>;
