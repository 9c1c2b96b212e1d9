import { z } from 'zod';
import { DRIVER_STATUSES, TEST_RESULTS } from '../constants';
import { idSchema, instantSchema } from './common';
import { defectCodeValueSchema } from './defects';

/** A driver's serial number as printed on its label. */
export const serialSchema = z
  .string()
  .trim()
  .min(1, 'is required')
  .max(64, 'is at most 64 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'may hold only letters, digits, ".", "_", "/" and "-"');

export const testResultValueSchema = z.enum(TEST_RESULTS);
export const driverStatusSchema = z.enum(DRIVER_STATUSES);

/** Named readings taken at final test, e.g. {fsHz: 38.5, reOhm: 6.2}. */
export const measurementsSchema = z
  .record(
    z.string().regex(/^[A-Za-z][A-Za-z0-9_]{0,39}$/, 'names are letters, digits and "_" (up to 40)'),
    z.number({ message: 'must be a number' }),
  )
  .refine((m) => Object.keys(m).length <= 50, 'hold at most 50 readings');

/** POST /api/tests: the result of one driver's final (listening and electrical) test. */
export const testInputSchema = z
  .object({
    serial: serialSchema,
    result: testResultValueSchema,
    defectCode: defectCodeValueSchema.optional(),
    measurements: measurementsSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.result === 'fail' && !v.defectCode) {
      ctx.addIssue({ code: 'custom', path: ['defectCode'], message: 'is required when the driver fails' });
    }
    if (v.result === 'pass' && v.defectCode) {
      ctx.addIssue({ code: 'custom', path: ['defectCode'], message: 'must be left out when the driver passes' });
    }
  });
export type TestInput = z.infer<typeof testInputSchema>;

/** One final-test result in a driver's history. */
export const testRecordSchema = z.object({
  id: idSchema,
  driverId: idSchema,
  result: testResultValueSchema,
  defectCode: z.string().nullable(),
  defectDescription: z.string().nullable(),
  measurements: z.record(z.string(), z.number()).nullable(),
  testedAt: instantSchema,
  testedBy: idSchema.nullable(),
  testedByName: z.string().nullable(),
});
export type TestRecord = z.infer<typeof testRecordSchema>;

/** 201 response of POST /api/tests. */
export const testCreatedSchema = z.object({
  test: testRecordSchema,
  driver: z.object({ id: idSchema, serial: z.string(), status: driverStatusSchema, previousStatus: driverStatusSchema }),
});
export type TestCreated = z.infer<typeof testCreatedSchema>;
