import { z } from 'zod';
import { idSchema } from './common';

/**
 * Label layouts (JSON templates in labels/layouts/) and the render request.
 * All sizes are millimetres; fonts are points. A layout places `grid.cols × grid.rows` labels
 * of `label` size on a page of `page` size, starting at the top-left margin, with `gapMm`
 * between neighbours. Single thermal labels are a 1×1 grid on a page of the label's size.
 */

export const LABEL_FIELDS = [
  'materialName',
  'materialCode',
  'supplierLot',
  'containerOfTotal',
  'receivedOn',
  'effectiveExpiry',
  'storageClass',
  'quantity',
  'supplierName',
] as const;
export type LabelField = (typeof LABEL_FIELDS)[number];

const mm = z.number().nonnegative();
const positiveMm = z.number().positive();

export const labelLayoutSchema = z.object({
  id: z.string().regex(/^[a-z0-9][a-z0-9-]*$/),
  name: z.string().min(1),
  kind: z.enum(['thermal', 'sheet']),
  /** Where the format comes from ("common practice", a standard's name…). */
  source: z.string().min(1),
  page: z.object({ widthMm: positiveMm, heightMm: positiveMm }),
  label: z.object({ widthMm: positiveMm, heightMm: positiveMm, cornerRadiusMm: mm.default(0) }),
  grid: z.object({ cols: z.number().int().positive(), rows: z.number().int().positive() }),
  marginsMm: z.object({ top: mm, right: mm, bottom: mm, left: mm }),
  gapMm: z.object({ col: mm, row: mm }),
  /** Space kept clear inside each label's edge (printer tolerance). */
  paddingMm: mm,
  qr: z.object({ sizeMm: positiveMm }),
  fontPt: z.object({ title: z.number().positive(), body: z.number().positive(), small: z.number().positive() }),
  /**
   * GHS pictograms: edge length of each diamond's bounding square. All of a material's
   * pictograms are printed in one row beside the signal word, smaller when many must fit.
   */
  pictogram: z.object({ sizeMm: positiveMm }),
  /**
   * Text lines beside the QR code, top to bottom; a line with several fields joins them with
   * " · ". The first line is printed in the title size. The container code is always printed
   * under the QR code.
   */
  lines: z.array(z.array(z.enum(LABEL_FIELDS)).min(1)).min(1),
});
export type LabelLayout = z.infer<typeof labelLayoutSchema>;

export const labelLayoutListSchema = z.object({ items: z.array(labelLayoutSchema) });

/**
 * GET /api/labels/render query: `layout` and either `lotId` (all containers of the lot) or
 * `containerIds` (comma-separated, for reprints). `skip` leaves that many positions empty at the
 * start of the first sheet (a part-used sheet).
 */
export const labelRenderQuerySchema = z
  .object({
    layout: z
      .string({ error: (i) => (i.input === undefined ? 'is required' : 'must be a layout id') })
      .min(1, 'is required')
      .max(60),
    lotId: idSchema.optional(),
    containerIds: z
      .preprocess(
        (v) =>
          typeof v === 'string'
            ? v
                .split(',')
                .map((s) => s.trim())
                .filter(Boolean)
            : v,
        z.array(idSchema).min(1, 'must list at least one container').max(500, 'must list at most 500 containers'),
      )
      .optional(),
    skip: z.coerce
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(0, 'must not be negative')
      .max(500, 'is too large')
      .default(0),
  })
  .superRefine((q, ctx) => {
    if (!q.lotId && !q.containerIds) ctx.addIssue({ code: 'custom', path: ['lotId'], message: 'or containerIds is required' });
    if (q.lotId && q.containerIds) ctx.addIssue({ code: 'custom', path: ['containerIds'], message: 'cannot be given together with lotId' });
  });
export type LabelRenderQuery = z.output<typeof labelRenderQuerySchema>;

/**
 * GET /api/labels/stations query: a station's code label (QR + code + name) in one of the
 * container label layouts. `skip` as for container labels; `copies` prints the same label again.
 */
export const stationLabelQuerySchema = z.object({
  layout: z
    .string({ error: (i) => (i.input === undefined ? 'is required' : 'must be a layout id') })
    .min(1, 'is required')
    .max(60),
  stationId: idSchema,
  copies: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(100, 'must be at most 100')
    .default(1),
  skip: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(0, 'must not be negative')
    .max(500, 'is too large')
    .default(0),
});
export type StationLabelQuery = z.output<typeof stationLabelQuerySchema>;
