import { z } from 'zod';
import { containerSchema } from './containers';
import { lotSchema } from './lots';
import { materialSchema, orRequired } from './materials';
import { stationScanResultSchema } from './stations';
import { batchScanResultSchema, driverScanResultSchema } from './batches';
import { mixScanResultSchema } from './mixes';

/**
 * POST /api/scans/resolve: what a scanned (or typed) code is.
 *
 * The server trims keyboard-wedge artefacts (trailing CR/LF/tab, surrounding spaces, a leading
 * symbology identifier such as `]Q1` or `]C1`) and then asks each resolver in turn. Tacklog's
 * container codes (see shared/schemas/containers.ts), also inside a URL, resolve to
 * `{type: 'container'}`; a supplier's GS1 element string or GS1 Digital Link to `{type: 'gs1'}`.
 * Other types (station, batch, driver) add their result schema to `scanResultSchema` below.
 * 400: malformed (empty, wrong check symbol or GS1 check digit, bad GS1 date…); 404: unknown.
 */
export const scanInputSchema = z.object({
  code: z.string(orRequired('must be text')).min(1, 'is required').max(2000, 'must be at most 2000 characters'),
});
export type ScanInput = z.input<typeof scanInputSchema>;

export const containerScanResultSchema = z.object({
  type: z.literal('container'),
  container: containerSchema,
  lot: lotSchema,
  material: materialSchema,
});
export type ContainerScanResult = z.infer<typeof containerScanResultSchema>;

export const gs1ScanResultSchema = z.object({
  type: z.literal('gs1'),
  /** AI (01), always 14 digits. */
  gtin: z.string().optional(),
  /** AI (10) batch/lot: the supplier lot number. */
  lot: z.string().optional(),
  /** AI (17) as YYYY-MM-DD (day 00 = last day of the month). */
  expiresOn: z.string().optional(),
  /** AI (11) as YYYY-MM-DD. */
  producedOn: z.string().optional(),
  /** AI (21). */
  serial: z.string().optional(),
  /** AI (30)/(37). */
  count: z.number().optional(),
  /** The catalogue material whose GTIN matches, when one does. */
  materialId: z.string().optional(),
  materialCode: z.string().optional(),
  materialName: z.string().optional(),
  /** Every element read, in order. */
  elements: z.array(z.object({ ai: z.string(), value: z.string() })),
});
export type Gs1ScanResult = z.infer<typeof gs1ScanResultSchema>;

/** Every kind of answer; other scan types add their schema to this list. */
export const scanResultSchema = z.discriminatedUnion('type', [
  containerScanResultSchema,
  gs1ScanResultSchema,
  stationScanResultSchema,
  batchScanResultSchema,
  mixScanResultSchema,
  driverScanResultSchema,
]);
export type ScanResult = z.infer<typeof scanResultSchema>;
