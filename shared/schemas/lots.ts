import { z } from 'zod';
import { LOT_STATUSES } from '../constants';
import { dateSchema, fitsColumn, idSchema, instantSchema, listFormatSchema, QUANTITY_COLUMN } from './common';
import { attachmentSchema } from './attachments';
import { containerSchema, fefoEntrySchema } from './containers';
import { gtinSchema, materialSchema, orRequired, requiredIdSchema } from './materials';
import { supplierSchema } from './suppliers';

/**
 * Lots: one supplier lot of one material as received (ISA-95 material lot).
 *
 * Status: new lots start `on_hold` when the material requires incoming inspection, else
 * `released`. Quality moves them (LOT_TRANSITIONS): on_hold → released | quarantined | rejected;
 * released → quarantined; quarantined → released | rejected. rejected and used_up are final.
 * A reason is required to quarantine, to reject and to lift a quarantine.
 */

export const lotStatusSchema = z.enum(LOT_STATUSES);

/** `:id` route parameter. */
export const lotParamsSchema = z.object({ id: idSchema });
export type { LotStatus } from '../constants';

/** Allowed status changes by a person (used_up is set by the system when the last container is emptied). */
export const LOT_TRANSITIONS: Record<(typeof LOT_STATUSES)[number], readonly (typeof LOT_STATUSES)[number][]> = {
  on_hold: ['released', 'quarantined', 'rejected'],
  released: ['quarantined'],
  quarantined: ['released', 'rejected'],
  rejected: [],
  used_up: [],
};

/** How far in the future a received time may be (clock drift between devices). */
export const RECEIVED_AT_TOLERANCE_MINUTES = 5;
export const MAX_CONTAINERS_PER_RECEIPT = 500;

/** POST /api/lots body. */
export const receiveLotInputSchema = z
  .object({
    materialId: requiredIdSchema,
    supplierId: requiredIdSchema,
    supplierLot: z.string(orRequired('must be text')).trim().min(1, 'is required').max(60, 'must be at most 60 characters'),
    containers: z
      .number(orRequired('must be a whole number of containers'))
      .int('must be a whole number of containers')
      .min(1, 'must be at least 1')
      .max(MAX_CONTAINERS_PER_RECEIPT, `must be at most ${MAX_CONTAINERS_PER_RECEIPT}`),
    quantityPerContainer: fitsColumn(
      z.number(orRequired('must be a number')).positive('must be more than 0').max(1e9, 'is too large'),
      QUANTITY_COLUMN,
    ),
    manufacturedOn: dateSchema.nullish(),
    expiresOn: dateSchema.nullish(),
    receivedAt: instantSchema.nullish(),
    /** GTIN from the supplier's barcode; must match the material's GTIN when the material has one. */
    gtin: gtinSchema.nullish(),
    /** Storage location for every container of the receipt (each can be moved later). */
    location: z
      .string()
      .trim()
      .max(80, 'must be at most 80 characters')
      .nullish()
      .transform((v) => (v ? v : null)),
    notes: z
      .string()
      .trim()
      .max(2000, 'must be at most 2000 characters')
      .nullish()
      .transform((v) => (v ? v : null)),
    /** Receive although the same supplier lot of this material was received before. */
    confirmDuplicate: z.boolean(orRequired('must be true or false')).default(false),
  })
  .superRefine((v, ctx) => {
    if (v.manufacturedOn && v.expiresOn && v.expiresOn < v.manufacturedOn) {
      ctx.addIssue({ code: 'custom', path: ['expiresOn'], message: 'must not be before manufacturedOn' });
    }
    const now = Date.now();
    if (v.receivedAt && Date.parse(v.receivedAt) > now + RECEIVED_AT_TOLERANCE_MINUTES * 60_000) {
      ctx.addIssue({ code: 'custom', path: ['receivedAt'], message: 'must not be in the future' });
    }
    // A manufacture date after the day of receipt (allowing a day for time zones) is a typing mistake.
    const received = v.receivedAt ? Date.parse(v.receivedAt) : now;
    if (v.manufacturedOn && Date.parse(`${v.manufacturedOn}T00:00:00Z`) > received + 86_400_000) {
      ctx.addIssue({ code: 'custom', path: ['manufacturedOn'], message: 'must not be after the day of receipt' });
    }
  });
export type ReceiveLotInput = z.input<typeof receiveLotInputSchema>;
export type ReceiveLotValues = z.output<typeof receiveLotInputSchema>;

/** POST /api/lots/:id/status body. */
export const lotStatusChangeSchema = z
  .object({
    status: z.enum(['released', 'quarantined', 'rejected'], orRequired('must be released, quarantined or rejected')),
    reason: z
      .string()
      .trim()
      .max(1000, 'must be at most 1000 characters')
      .nullish()
      .transform((v) => (v ? v : null)),
  })
  .superRefine((v, ctx) => {
    if ((v.status === 'quarantined' || v.status === 'rejected') && !v.reason) {
      ctx.addIssue({ code: 'custom', path: ['reason'], message: `is required to set a lot ${v.status}` });
    }
  });
export type LotStatusChange = z.input<typeof lotStatusChangeSchema>;

export const LOT_SORTS = ['receivedAt', 'effectiveExpiry', 'supplierLot', 'status', 'material'] as const;

const commaList = <T extends z.ZodTypeAny>(item: T) =>
  z.preprocess(
    (v) =>
      typeof v === 'string'
        ? v
            .split(',')
            .map((s) => s.trim())
            .filter(Boolean)
        : Array.isArray(v)
          ? v
          : v === undefined
            ? undefined
            : [v],
    z.array(item).min(1).optional(),
  );

/** GET /api/lots query: paging, sorting, filters. `status` may list several, comma-separated. */
export const lotListQuerySchema = z.object({
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(500, 'must be at most 500')
    .default(50),
  offset: z.coerce.number({ error: 'must be a number' }).int('must be a whole number').min(0, 'must not be negative').default(0),
  sort: z.enum(LOT_SORTS, { error: `must be one of: ${LOT_SORTS.join(', ')}` }).default('receivedAt'),
  dir: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).default('desc'),
  status: commaList(lotStatusSchema),
  materialId: idSchema.optional(),
  supplierId: idSchema.optional(),
  /** Lots whose effective expiry is within this many days from now (already expired ones included). */
  expiringWithinDays: z.coerce
    .number({ error: 'must be a number of days' })
    .int('must be a whole number of days')
    .min(0, 'must not be negative')
    .max(3650, 'must be at most 3650')
    .optional(),
  format: listFormatSchema,
  /** Text search in supplier lot numbers and container codes. */
  q: z
    .string()
    .trim()
    .max(100, 'must be at most 100 characters')
    .optional()
    .transform((v) => (v ? v : undefined)),
});
export type LotListQuery = z.output<typeof lotListQuerySchema>;

export const lotSchema = z.object({
  id: idSchema,
  materialId: idSchema,
  supplierId: idSchema,
  supplierLot: z.string(),
  gtin: z.string().nullable(),
  status: lotStatusSchema,
  receivedAt: instantSchema,
  manufacturedOn: dateSchema.nullable(),
  expiresOn: dateSchema.nullable(),
  certificateId: idSchema.nullable(),
  certificateExpiresOn: dateSchema.nullable(),
  notes: z.string().nullable(),
  receivedBy: idSchema.nullable(),
  statusReason: z.string().nullable(),
  statusChangedAt: instantSchema.nullable(),
  /** Lot-level expiry, unopened (shared/expiry.ts lotExpiry); null when no limit applies. */
  effectiveExpiry: instantSchema.nullable(),
  expiryCause: z.string().nullable(),
  createdAt: instantSchema,
});
export type Lot = z.infer<typeof lotSchema>;

/** A row of GET /api/lots. `remaining` is the sum over sealed and open containers. */
export const lotListItemSchema = lotSchema.extend({
  materialCode: z.string(),
  materialName: z.string(),
  materialUnit: z.string(),
  supplierName: z.string(),
  containerCount: z.number().int(),
  /** Containers still sealed or open. */
  activeContainerCount: z.number().int(),
  remaining: z.number(),
});
export type LotListItem = z.infer<typeof lotListItemSchema>;

export const lotPageSchema = z.object({ items: z.array(lotListItemSchema), total: z.number().int().nonnegative() });
export type LotPage = z.infer<typeof lotPageSchema>;

/** POST /api/lots → 201. */
export const receiveLotResultSchema = z.object({ lot: lotSchema, containers: z.array(containerSchema) });
export type ReceiveLotResult = z.infer<typeof receiveLotResultSchema>;

const existingLotSchema = z.object({
  id: idSchema,
  supplierLot: z.string(),
  supplierId: idSchema,
  supplierName: z.string(),
  receivedAt: instantSchema,
  status: lotStatusSchema,
  containerCount: z.number().int(),
});

/** 409 DUPLICATE_LOT `details`: the most recent lot with this supplier lot number, and all of them. */
export const duplicateLotDetailsSchema = z.object({
  existingLot: existingLotSchema,
  existingLots: z.array(existingLotSchema),
});
export type DuplicateLotDetails = z.infer<typeof duplicateLotDetailsSchema>;

/**
 * GET /api/lots/:id. `fefoNext` is the container of this material to use next plant-wide
 * (it may belong to another lot), or null when none is usable.
 */
export const lotDetailSchema = z.object({
  lot: lotSchema,
  material: materialSchema,
  supplier: supplierSchema,
  containers: z.array(containerSchema),
  effectiveExpiry: instantSchema.nullable(),
  expiryCause: z.string().nullable(),
  certificate: attachmentSchema.nullable(),
  fefoNext: fefoEntrySchema.nullable(),
});
export type LotDetail = z.infer<typeof lotDetailSchema>;

export const lotResultSchema = z.object({ lot: lotSchema });

/** One line of GET /api/lots/:id/history (audit entries of the lot and its containers). */
export const historyEntrySchema = z.object({
  id: z.number().int(),
  at: instantSchema,
  actorId: idSchema.nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string(),
  /** Container code when the entry is about a container. */
  containerCode: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
  reason: z.string().nullable(),
  /**
   * What the ids in `before` / `after` are called, so people read names, not ids: a
   * certificate by its file name, a station, batch, mix or container by its code, a supplier or
   * material by its name. Ids that no longer resolve are left out.
   */
  names: z.record(z.string(), z.string()).default({}),
});
export type HistoryEntry = z.infer<typeof historyEntrySchema>;
/** GET /api/lots/:id/history (`lots.readHistory`: quality, admin). */
export const lotHistorySchema = z.object({ items: z.array(historyEntrySchema) });

/**
 * One line of GET /api/lots/:id/status-changes (anyone signed in): how the lot's status moved,
 * when and why. No names and no before/after records: the full history is for quality and
 * administrators (`lots.readHistory`).
 */
export const statusChangeEntrySchema = z.object({
  at: instantSchema,
  /** Null for the status the lot was received with. */
  from: lotStatusSchema.nullable(),
  to: lotStatusSchema,
  reason: z.string().nullable(),
});
export type StatusChangeEntry = z.infer<typeof statusChangeEntrySchema>;
export const lotStatusChangesSchema = z.object({ items: z.array(statusChangeEntrySchema) });

/** POST /api/lots/:id/certificate → 201. */
export const certificateResultSchema = z.object({ attachment: attachmentSchema, lot: lotSchema });
