import { z } from 'zod';
import { STEP_RUN_KINDS } from '../constants';
import { idSchema, instantSchema } from './common';

/** Body of POST /api/batches/:id/steps/:stepId/start and …/finish. */
export const stepActionInputSchema = z.object({
  stationId: idSchema,
  /** Single-unit (rework) run: the driver's serial; it must belong to the batch. */
  serial: z.string().trim().min(1, 'is required').max(64, 'is at most 64 characters').optional(),
  /** Finish of a UV step: the exposure time under the lamp, seconds (dose = irradiance × time). */
  exposureSeconds: z.number().positive('must be more than 0 seconds').max(86400, 'must be at most a day (86,400 s)').optional(),
});
export type StepActionInput = z.infer<typeof stepActionInputSchema>;

export const stepParamsSchema = z.object({ id: idSchema, stepId: idSchema });

/** One container or mix a step run used (the genealogy link). */
export const stepRunMaterialSchema = z.object({
  id: idSchema,
  containerId: idSchema.nullable(),
  containerCode: z.string().nullable(),
  mixId: idSchema.nullable(),
  mixCode: z.string().nullable(),
  /** The container's material, or a mix's resin material. */
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  unit: z.string(),
  /** The container's lot, or a mix's resin lot. */
  lotId: idSchema,
  supplierLot: z.string(),
  quantityUsed: z.number(),
  loadedAt: instantSchema,
});
export type StepRunMaterial = z.infer<typeof stepRunMaterialSchema>;

export const stepRunSchema = z.object({
  id: idSchema,
  batchId: idSchema,
  stepId: idSchema,
  stationId: idSchema,
  driverId: idSchema.nullable(),
  serial: z.string().nullable(),
  kind: z.enum(STEP_RUN_KINDS),
  startedAt: instantSchema,
  finishedAt: instantSchema.nullable(),
  startedBy: idSchema.nullable(),
  finishedBy: idSchema.nullable(),
  /** When the adhesive used may be handled / is fully cured (computed at finish from the area's readings). */
  handlingAt: instantSchema.nullable(),
  cureCompleteAt: instantSchema.nullable(),
  /** Started before the previous step's cure was complete (with a quality deviation). */
  shortCure: z.boolean(),
  deviationId: idSchema.nullable(),
  unitsDone: z.number().int().nullable(),
  materials: z.array(stepRunMaterialSchema),
  /** A UV step's dose at its finish: irradiance of the lamp's latest radiometer reading × the exposure given. */
  uv: z
    .object({
      exposureSeconds: z.number(),
      irradianceMWcm2: z.number(),
      doseMJcm2: z.number(),
      neededMJcm2: z.number(),
    })
    .nullable()
    .default(null),
});
export type StepRun = z.infer<typeof stepRunSchema>;

export const stepRunResultSchema = z.object({ stepRun: stepRunSchema });
export type StepRunResult = z.infer<typeof stepRunResultSchema>;

/** Details of a 409 CURE_INCOMPLETE refusal. */
export const cureIncompleteDetailsSchema = z.object({
  cureCompleteAt: instantSchema.nullable(),
  handlingAt: instantSchema.nullable(),
  stepRunId: idSchema,
  stepId: idSchema,
});
export type CureIncompleteDetails = z.infer<typeof cureIncompleteDetailsSchema>;

/** Details of a 409 UV_DOSE_LOW refusal (irradiance null: the lamp has no radiometer reading). */
export const uvDoseLowDetailsSchema = z.object({
  doseMJcm2: z.number(),
  neededMJcm2: z.number(),
  irradianceMWcm2: z.number().nullable(),
  exposureSeconds: z.number(),
});
export type UvDoseLowDetails = z.infer<typeof uvDoseLowDetailsSchema>;
