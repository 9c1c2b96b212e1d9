/**
 * Stock, days of cover, reorder advice and the expiry outlook (GET /api/stock…, POST
 * /api/stock/simulate). Used by the routes, the client fetchers and the tests.
 */
import { z } from 'zod';
import { dateSchema, idSchema, instantSchema } from './common';
import { LOT_STATUSES, CONTAINER_STATUSES } from '../constants';

const quantity = z.number().finite().min(0, 'must be 0 or more').max(1e9, 'is too large');
const positiveQty = z.number().finite().gt(0, 'must be more than 0').max(1e9, 'is too large');
const lifeHours = z.number().finite().gt(0, 'must be more than 0 hours').max(1e6, 'is too long');

// --- POST /api/stock/simulate ----------------------------------------------------------------

export const simContainerInputSchema = z.object({
  quantity: positiveQty,
  expiresAt: instantSchema.nullable(),
  openLifeHours: lifeHours.nullish(),
  openedAt: instantSchema.nullish(),
});

export const simIncomingInputSchema = z.object({
  arrivesAt: instantSchema,
  quantity: positiveQty,
  expiresAt: instantSchema.nullable(),
  openLifeHours: lifeHours.nullish(),
});

export const simulateInputSchema = z
  .object({
    start: instantSchema,
    dailyUse: quantity,
    containers: z.array(simContainerInputSchema).max(5000, 'at most 5000 containers'),
    incoming: z.array(simIncomingInputSchema).max(500, 'at most 500 deliveries').optional(),
    horizonDays: z.number().finite().gt(0, 'must be more than 0 days').max(3650, 'at most 3650 days (10 years)').optional(),
  })
  .superRefine((v, ctx) => {
    const start = Date.parse(v.start);
    v.containers.forEach((c, i) => {
      if (c.openedAt && Date.parse(c.openedAt) > start) {
        ctx.addIssue({ code: 'custom', path: ['containers', i, 'openedAt'], message: 'must not be after start' });
      }
    });
  });
export type SimulateInput = z.infer<typeof simulateInputSchema>;

export const simEndSchema = z.enum(['empty', 'expired', 'horizon']);

export const simContainerResultSchema = z.object({
  used: z.number(),
  wasted: z.number(),
  left: z.number(),
  openedAt: instantSchema.nullable(),
  expiresAt: instantSchema.nullable(),
  endedAt: instantSchema,
  endedBy: simEndSchema,
});

export const simulateResultSchema = z.object({
  start: instantSchema,
  horizonAt: instantSchema,
  dailyUse: z.number(),
  runsOutAt: instantSchema.nullable(),
  used: z.number(),
  wasted: z.number(),
  left: z.number(),
  containers: z.array(simContainerResultSchema),
  incoming: z.array(simContainerResultSchema),
  openOrder: z.array(z.number().int()),
});
export type SimulateResult = z.infer<typeof simulateResultSchema>;

// --- GET /api/stock ----------------------------------------------------------------------------

export const STOCK_VIEWS = ['all', 'act', 'waste', 'reorder'] as const;
export type StockView = (typeof STOCK_VIEWS)[number];
export const STOCK_SORTS = ['code', 'daysOfCover', 'runsOutAt', 'predictedWaste', 'orderBy', 'usableOnHand'] as const;
export type StockSort = (typeof STOCK_SORTS)[number];

export const stockQuerySchema = z.object({
  q: z.string().trim().max(100, 'is too long').optional(),
  view: z.enum(STOCK_VIEWS, { message: `must be one of ${STOCK_VIEWS.join(', ')}` }).default('all'),
  sort: z.enum(STOCK_SORTS, { message: `must be one of ${STOCK_SORTS.join(', ')}` }).default('daysOfCover'),
  dir: z.enum(['asc', 'desc'], { message: 'must be asc or desc' }).default('asc'),
  format: z.enum(['json', 'csv'], { message: 'must be json or csv' }).default('json'),
});
export type StockQuery = z.infer<typeof stockQuerySchema>;

export const adviceActionSchema = z.enum(['order_now', 'order_soon', 'enough', 'not_used']);
export type AdviceActionValue = z.infer<typeof adviceActionSchema>;

export const packWarningSchema = z.object({
  packSize: z.number(),
  usablePerPack: z.number(),
  wastePerPack: z.number(),
  limitedBy: z.enum(['open_life', 'shelf_life']),
  suggestedPackSize: z.number().nullable(),
  text: z.string(),
});

export const stockAdviceSchema = z.object({
  action: adviceActionSchema,
  /** One sentence a buyer can act on. */
  text: z.string(),
  orderBy: instantSchema.nullable(),
  orderByDate: dateSchema.nullable(),
  quantity: z.number().nullable(),
  orderQuantities: z.number().int().nullable(),
  limitedByShelfLife: z.boolean(),
  runOutInsideLeadTime: z.boolean(),
  belowReorderPoint: z.boolean(),
  pack: packWarningSchema.nullable(),
  /** Shelf life left when a delivery arrives: median of past receipts, or the nominal shelf life. */
  lifeAtArrivalDays: z.number().nullable(),
  lifeAtArrivalSource: z.enum(['receipts', 'nominal']).nullable(),
  /** Median age (days since manufacture) of past receipts, when manufacture dates are known. */
  ageAtReceiptDays: z.number().nullable(),
  receiptsCounted: z.number().int(),
});
export type StockAdvice = z.infer<typeof stockAdviceSchema>;

export const stockItemSchema = z.object({
  materialId: idSchema,
  code: z.string(),
  name: z.string(),
  kind: z.string(),
  unit: z.string(),
  onHand: z.object({ released: z.number(), onHold: z.number(), quarantined: z.number() }),
  /** Released and on-hold stock not yet expired: what the simulation uses. */
  usableOnHand: z.number(),
  /** Already past its effective expiry but still in stock. */
  expiredOnHand: z.number(),
  reorderPoint: z.number().nullable(),
  orderQuantity: z.number().nullable(),
  leadTimeDays: z.number().int().nullable(),
  packSize: z.number().nullable(),
  dailyUse: z.number(),
  dailyUseSource: z.enum(['history', 'plan']),
  dailyUseHistory: z.number(),
  dailyUsePlan: z.number().nullable(),
  /** From the FEFO simulation; null when nothing is used or the stock outlasts the horizon. */
  daysOfCover: z.number().nullable(),
  /** usableOnHand ÷ dailyUse, for comparison (what cover would be if nothing expired). */
  daysOfCoverIgnoringExpiry: z.number().nullable(),
  coverBeyondHorizon: z.boolean(),
  runsOutAt: instantSchema.nullable(),
  runsOutOn: dateSchema.nullable(),
  predictedWaste: z.number(),
  advice: stockAdviceSchema,
});
export type StockItem = z.infer<typeof stockItemSchema>;

export const stockSettingsSchema = z.object({
  useWindowDays: z.number(),
  planDays: z.number(),
  safetyDays: z.number(),
  horizonDays: z.number(),
  expiringSoonDays: z.number(),
});

export const stockListSchema = z.object({
  items: z.array(stockItemSchema),
  total: z.number().int(),
  asOf: instantSchema,
  zone: z.string(),
  settings: stockSettingsSchema,
});
export type StockList = z.infer<typeof stockListSchema>;

// --- GET /api/stock/materials/:id -----------------------------------------------------------

export const stockMaterialParamsSchema = z.object({ id: idSchema });

export const stockContainerSchema = z.object({
  containerId: idSchema,
  code: z.string(),
  lotId: idSchema,
  supplierLot: z.string(),
  lotStatus: z.enum(LOT_STATUSES),
  status: z.enum(CONTAINER_STATUSES),
  remaining: z.number(),
  location: z.string().nullable(),
  /** Position in the order of use (1 = in use or next); null when it will not be used. */
  useOrder: z.number().int().nullable(),
  /** Effective expiry now (sealed: shelf expiry; open: after-opening life counted). */
  expiresAt: instantSchema.nullable(),
  counted: z.boolean(),
  /** Why a container is left out of the simulation ("quarantined", "expired"). */
  notCountedReason: z.string().nullable(),
  sim: simContainerResultSchema.nullable(),
});
export type StockContainer = z.infer<typeof stockContainerSchema>;

export const stockMaterialSchema = z.object({
  item: stockItemSchema,
  containers: z.array(stockContainerSchema),
  asOf: instantSchema,
  zone: z.string(),
});
export type StockMaterial = z.infer<typeof stockMaterialSchema>;

// --- GET /api/stock/outlook -----------------------------------------------------------------

export const outlookQuerySchema = z.object({
  weeks: z.coerce
    .number({ message: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be 1 or more')
    .max(52, 'at most 52')
    .default(12),
  format: z.enum(['json', 'csv'], { message: 'must be json or csv' }).default('json'),
});

export const outlookWeekSchema = z.object({ start: dateSchema, end: dateSchema });

export const outlookSeriesSchema = z.object({
  materialId: idSchema,
  code: z.string(),
  name: z.string(),
  unit: z.string(),
  used: z.array(z.number()),
  wasted: z.array(z.number()),
});

export const outlookLotSchema = z.object({
  lotId: idSchema,
  supplierLot: z.string(),
  lotStatus: z.enum(LOT_STATUSES),
  materialId: idSchema,
  materialCode: z.string(),
  materialName: z.string(),
  unit: z.string(),
  /** Earliest effective expiry of its containers inside the outlook. */
  expiresAt: instantSchema,
  week: z.number().int(),
  quantity: z.number(),
  usedBeforeExpiry: z.number(),
  predictedWaste: z.number(),
});
export type OutlookLot = z.infer<typeof outlookLotSchema>;

export const outlookSchema = z.object({
  asOf: instantSchema,
  zone: z.string(),
  weeks: z.array(outlookWeekSchema),
  series: z.array(outlookSeriesSchema),
  lots: z.array(outlookLotSchema),
});
export type Outlook = z.infer<typeof outlookSchema>;

export const OUTLOOK_COLUMNS = [
  { key: 'week', label: 'Week of' },
  { key: 'expiresAt', label: 'Expires' },
  { key: 'material', label: 'Material' },
  { key: 'supplierLot', label: 'Supplier lot' },
  { key: 'lotStatus', label: 'Lot status' },
  { key: 'quantity', label: 'Expiring' },
  { key: 'usedBeforeExpiry', label: 'Used before expiry' },
  { key: 'predictedWaste', label: 'Predicted waste' },
] as const;

// --- GET /api/stock/today (the purchasing home page) ----------------------------------------

export const stockTodaySchema = z.object({
  asOf: instantSchema,
  zone: z.string(),
  runOuts: z.array(
    z.object({
      materialId: idSchema,
      code: z.string(),
      name: z.string(),
      unit: z.string(),
      runsOutAt: instantSchema.nullable(),
      leadTimeDays: z.number().int().nullable(),
      adviceText: z.string(),
    }),
  ),
  wasteThisMonth: z.object({
    monthEnd: instantSchema,
    items: z.array(z.object({ materialId: idSchema, code: z.string(), name: z.string(), unit: z.string(), quantity: z.number() })),
  }),
  expiringLots: z.object({
    days: z.number().int(),
    items: z.array(
      z.object({
        lotId: idSchema,
        supplierLot: z.string(),
        lotStatus: z.enum(LOT_STATUSES),
        materialCode: z.string(),
        materialName: z.string(),
        unit: z.string(),
        expiresAt: instantSchema,
        remaining: z.number(),
      }),
    ),
  }),
});
export type StockToday = z.infer<typeof stockTodaySchema>;
