import { z } from 'zod';
import { AMOUNT_PER_UNIT_COLUMN, fitsColumn, idSchema, instantSchema } from './common';

const text = (max: number) => z.string().trim().min(1, 'is required').max(max, `is at most ${max} characters`);

export const modelCodeSchema = z
  .string()
  .trim()
  .min(1, 'is required')
  .max(24, 'is at most 24 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9_-]*$/, 'may hold letters, digits, dash and underscore only (it starts every serial)');

export const recipeMaterialSchema = z.object({
  materialId: idSchema,
  /** In the material's unit, per driver. */
  amountPerUnit: fitsColumn(z.number().positive('must be more than 0').max(1_000_000, 'is too large'), AMOUNT_PER_UNIT_COLUMN),
});
export type RecipeMaterial = z.infer<typeof recipeMaterialSchema>;

export const recipeStepSchema = z.object({
  id: idSchema,
  seq: z.number().int().positive(),
  name: z.string(),
  stationKind: z.string(),
  materials: z.array(recipeMaterialSchema),
  /** The next step may not start before this step's adhesive has cured. */
  waitForCure: z.boolean(),
});
export type RecipeStep = z.infer<typeof recipeStepSchema>;

export const driverModelSchema = z.object({
  id: idSchema,
  code: z.string(),
  name: z.string(),
  description: z.string().nullable(),
  active: z.boolean(),
  /** Ordered by seq. */
  steps: z.array(recipeStepSchema),
  /** True once a build batch has used the model (its steps can no longer be replaced). */
  inUse: z.boolean(),
  /** Build batches built with this revision. */
  batchCount: z.number().int().nonnegative().default(0),
  createdAt: instantSchema,
  /** Recipe revision (1, 2, …): a revision used by a batch is frozen; a copy becomes the next one. */
  revision: z.number().int().positive(),
  /** The revision new batches are built with. */
  current: z.boolean(),
});
export type DriverModel = z.infer<typeof driverModelSchema>;

export const recipeStepInputSchema = z.object({
  /** Optional: when given on every step they must be distinct; otherwise the list order is used. */
  seq: z.number().int().positive('must be a whole number above 0').max(999).optional(),
  name: text(120),
  stationKind: text(80),
  materials: z.array(recipeMaterialSchema).max(50).default([]),
  waitForCure: z.boolean().default(false),
});
export type RecipeStepInput = z.infer<typeof recipeStepInputSchema>;

const stepsInputSchema = z
  .array(recipeStepInputSchema)
  .min(1, 'needs at least one step')
  .max(50, 'has at most 50 steps')
  .superRefine((steps, ctx) => {
    const given = steps.filter((s) => s.seq !== undefined).length;
    if (given !== 0 && given !== steps.length) {
      ctx.addIssue({ code: 'custom', message: 'give seq on every step or on none', path: [] });
    }
    const seen = new Set<number>();
    steps.forEach((s, i) => {
      if (s.seq !== undefined) {
        if (seen.has(s.seq)) ctx.addIssue({ code: 'custom', message: "repeats another step's seq", path: [i, 'seq'] });
        seen.add(s.seq);
      }
      const ids = new Set<string>();
      s.materials.forEach((m, j) => {
        if (ids.has(m.materialId)) {
          ctx.addIssue({ code: 'custom', message: 'is listed twice in this step', path: [i, 'materials', j, 'materialId'] });
        }
        ids.add(m.materialId);
      });
    });
  });

/** POST /api/models (admin): a DriverModel without ids. */
export const driverModelInputSchema = z.object({
  code: modelCodeSchema,
  name: text(120),
  description: z.string().trim().max(1000).nullish(),
  steps: stepsInputSchema,
});
export type DriverModelInput = z.infer<typeof driverModelInputSchema>;

/** PATCH /api/models/:id (admin). `steps` replaces the recipe, only while no batch has used the model. */
export const driverModelPatchSchema = z
  .object({
    name: text(120).optional(),
    description: z.string().trim().max(1000).nullish(),
    active: z.boolean().optional(),
    steps: stepsInputSchema.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'names no field to change' });
export type DriverModelPatch = z.infer<typeof driverModelPatchSchema>;

export const modelListQuerySchema = z.object({
  includeRetired: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
  /** Every revision, not only the current ones (the recipes page). */
  includeRevisions: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
  /** Only this model code (its revisions, with includeRevisions). */
  code: modelCodeSchema.optional(),
});

/** How people name a revision: "HB12W rev 2". */
export function revisionLabel(model: { code: string; revision: number }): string {
  return `${model.code} rev ${model.revision}`;
}

export const driverModelListSchema = z.object({ items: z.array(driverModelSchema) });
