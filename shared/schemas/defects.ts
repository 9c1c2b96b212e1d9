import { z } from 'zod';

/**
 * Defect codes name why a driver failed final test (e.g. RUB-BUZZ). The list is edited by
 * quality and admin; a code is never deleted, only made inactive, so old results keep it.
 */
export const defectCodeValueSchema = z
  .string()
  .trim()
  .toUpperCase()
  .min(1, 'is required')
  .max(20, 'is at most 20 characters')
  .regex(/^[A-Z0-9][A-Z0-9_-]*$/, 'may hold only letters, digits, "-" and "_"');

export const defectCodeSchema = z.object({
  code: z.string(),
  description: z.string(),
  active: z.boolean(),
});
export type DefectCode = z.infer<typeof defectCodeSchema>;

export const defectCodeListSchema = z.object({ items: z.array(defectCodeSchema) });
export type DefectCodeList = z.infer<typeof defectCodeListSchema>;

export const defectCodeListQuerySchema = z.object({
  /** `true` lists only the codes a tester may pick. */
  active: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => (v === undefined ? undefined : v === 'true')),
});
export type DefectCodeListQuery = z.infer<typeof defectCodeListQuerySchema>;

const descriptionSchema = z.string().trim().min(3, 'is at least 3 characters').max(200, 'is at most 200 characters');

export const defectCodeCreateSchema = z.object({
  code: defectCodeValueSchema,
  description: descriptionSchema,
});
export type DefectCodeCreate = z.infer<typeof defectCodeCreateSchema>;

export const defectCodeUpdateSchema = z
  .object({
    description: descriptionSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => v.description !== undefined || v.active !== undefined, {
    message: 'give a description or active',
    path: ['description'],
  });
export type DefectCodeUpdate = z.infer<typeof defectCodeUpdateSchema>;

export const defectCodeParamsSchema = z.object({ code: defectCodeValueSchema });
