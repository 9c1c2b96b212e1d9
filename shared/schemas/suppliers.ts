import { z } from 'zod';
import { idSchema, instantSchema } from './common';
import { orRequired } from './materials';

/**
 * Suppliers (admin and purchasing keep them). `code` is optional on create: the server derives
 * one from the name (upper-case letters and digits, e.g. "SUP-CORVANE") when it is left out.
 * Names are unique without regard to case; codes are unique.
 */

/** `:id` route parameter. */
export const supplierParamsSchema = z.object({ id: idSchema });

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `must be at most ${max} characters`)
    .nullish()
    .transform((v) => (v === '' ? null : v));

export const supplierCodeSchema = z
  .string()
  .trim()
  .min(1, 'is required')
  .max(40, 'must be at most 40 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, 'may contain letters, digits and . _ - / only');

export const supplierFieldsSchema = z.object({
  name: z.string(orRequired('must be text')).trim().min(1, 'is required').max(200, 'must be at most 200 characters'),
  code: supplierCodeSchema.optional(),
  contactName: optionalText(200),
  email: z
    .string()
    .trim()
    .max(254, 'is too long')
    .nullish()
    .transform((v) => (v === '' ? null : v))
    .refine((v) => v == null || z.email().safeParse(v).success, 'must be an e-mail address'),
  phone: optionalText(60),
  address: optionalText(500),
  notes: optionalText(2000),
});

/** POST /api/suppliers body. */
export const supplierInputSchema = supplierFieldsSchema;
export type SupplierInput = z.input<typeof supplierInputSchema>;
export type SupplierValues = z.output<typeof supplierInputSchema>;

/** PATCH /api/suppliers/:id body; `active: true` reinstates a retired supplier. */
export const supplierPatchSchema = supplierFieldsSchema
  .extend({ active: z.boolean(orRequired('must be true or false')) })
  .partial()
  .refine((p) => Object.keys(p).length > 0, { message: 'says nothing to change' });
export type SupplierPatch = z.input<typeof supplierPatchSchema>;

/** GET /api/suppliers query. */
export const supplierListQuerySchema = z.object({
  active: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
});

export const supplierSchema = z.object({
  id: idSchema,
  code: z.string(),
  name: z.string(),
  contactName: z.string().nullable(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  address: z.string().nullable(),
  notes: z.string().nullable(),
  active: z.boolean(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
});
export type Supplier = z.infer<typeof supplierSchema>;

export const supplierListSchema = z.object({ items: z.array(supplierSchema) });
