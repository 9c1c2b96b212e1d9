import { z } from 'zod';
import { MIX_STATUSES } from '../constants';
import { fitsColumn, idSchema, instantSchema, QUANTITY_COLUMN } from './common';
import { expiryCauseSchema } from './station-loads';

const scannedCode = z.string().trim().min(1, 'is required').max(200, 'is at most 200 characters');
const quantity = fitsColumn(z.number().positive('must be more than 0').max(1_000_000, 'is too large'), QUANTITY_COLUMN);

/** POST /api/stations/:id/mixes (assembler). Quantities in the materials' units. */
export const mixInputSchema = z.object({
  resinCode: scannedCode,
  hardenerCode: scannedCode,
  resinQuantity: quantity,
  hardenerQuantity: quantity,
});
export type MixInput = z.infer<typeof mixInputSchema>;

/** Where the temperature used for the pot-life adjustment came from. */
export const MIX_TEMP_SOURCES = ['reading', 'reference'] as const;

export const mixSchema = z.object({
  id: idSchema,
  /** Scannable: MX-<yyMMdd>-<seq of the day>. */
  code: z.string(),
  stationId: idSchema,
  resinContainerId: idSchema,
  resinContainerCode: z.string(),
  resinMaterialId: idSchema,
  hardenerContainerId: idSchema,
  hardenerContainerCode: z.string(),
  hardenerMaterialId: idSchema,
  resinQuantity: z.number(),
  hardenerQuantity: z.number(),
  remaining: z.number(),
  mixedAt: instantSchema,
  /** Pot life from mixing, adjusted to the temperature below. */
  potLifeEndsAt: instantSchema,
  tempC: z.number().nullable(),
  status: z.enum(MIX_STATUSES),
  mixedBy: idSchema.nullable(),
});
export type Mix = z.infer<typeof mixSchema>;

export const mixTemperatureSchema = z.object({
  tempC: z.number(),
  source: z.enum(MIX_TEMP_SOURCES),
  /** The reading used (source 'reading'). */
  readingAt: instantSchema.nullable(),
  area: z.string(),
  /** Pot life at that temperature, minutes (rounded to 0.1). */
  potLifeMinutes: z.number(),
  referencePotLifeMinutes: z.number(),
});

/** 201 answer of POST /api/stations/:id/mixes and GET /api/mixes/:id. */
export const mixResultSchema = z.object({ mix: mixSchema, temperature: mixTemperatureSchema.optional() });
export type MixResult = z.infer<typeof mixResultSchema>;

/** POST /api/scans/resolve answer for a mix's code. */
export const mixScanResultSchema = z.object({
  type: z.literal('mix'),
  mix: mixSchema,
  /** Effective expiry: the pot-life end, or an earlier limit of a part's lot. */
  expiresAt: instantSchema,
  expiryCause: expiryCauseSchema,
});
export type MixScanResult = z.infer<typeof mixScanResultSchema>;
