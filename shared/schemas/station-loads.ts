import { z } from 'zod';
import { CONTAINER_STATUSES, LOT_STATUSES, MATERIAL_KINDS, MIX_STATUSES } from '../constants';
import { idSchema, instantSchema } from './common';

const scannedCode = z.string().trim().min(1, 'is required').max(200, 'is at most 200 characters');

/** POST /api/stations/:id/load (assembler): a container's code or a mix's code, for one batch. */
export const loadInputSchema = z
  .object({
    batchId: idSchema,
    containerCode: scannedCode.optional(),
    mixCode: scannedCode.optional(),
    /** Rework of one driver: its serial. The batch may then be finished (not cancelled). */
    serial: z.string().trim().min(1, 'is required').max(60, 'is at most 60 characters').optional(),
    /** Rework: which recipe step the material is for (default: the first step run at this station's kind). */
    stepId: idSchema.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.stepId && !v.serial) {
      ctx.addIssue({ code: 'custom', path: ['stepId'], message: 'is only for a rework load (give serial too)' });
    }
    if (!v.containerCode && !v.mixCode) {
      ctx.addIssue({ code: 'custom', path: ['containerCode'], message: 'or mixCode is required' });
    }
    if (v.containerCode && v.mixCode) {
      ctx.addIssue({ code: 'custom', path: ['mixCode'], message: 'cannot be given with containerCode' });
    }
  });
export type LoadInput = z.infer<typeof loadInputSchema>;

/**
 * Why a station refuses a load (409 `error.code`). The message names what to do.
 * The same checks guard mixing (POST /api/stations/:id/mixes) and step start.
 */
export const LOAD_REFUSALS = [
  'WRONG_MATERIAL',
  'WRONG_STATION',
  'LOT_ON_HOLD',
  'LOT_QUARANTINED',
  'LOT_REJECTED',
  'EXPIRED',
  'OPEN_LIFE_EXCEEDED',
  'POT_LIFE_EXCEEDED',
  'CONTAINER_EMPTY',
  'CONTAINER_SCRAPPED',
  'STATION_RETIRED',
  'BATCH_CLOSED',
  'MIX_DISCARDED',
] as const;
export type LoadRefusal = (typeof LOAD_REFUSALS)[number];

/** What caused an effective expiry (see shared/expiry.ts). */
export const EXPIRY_CAUSES = ['supplier_expiry', 'shelf_life', 'open_life', 'thawed_life', 'out_of_storage', 'pot_life'] as const;
export const expiryCauseSchema = z.enum(EXPIRY_CAUSES);
export type ExpiryCause = z.infer<typeof expiryCauseSchema>;

export const loadedMaterialSchema = z.object({
  id: idSchema,
  code: z.string(),
  name: z.string(),
  kind: z.enum(MATERIAL_KINDS),
  unit: z.string(),
  /** For the station screen's safety panel (GHS; the SDS governs). */
  hazards: z.object({
    signalWord: z.enum(['Danger', 'Warning']).optional(),
    pictograms: z.array(z.string()),
    statements: z.array(z.string()),
  }),
  sdsAttachmentId: idSchema.nullable(),
});
export type LoadedMaterial = z.infer<typeof loadedMaterialSchema>;

export const loadedLotSchema = z.object({
  id: idSchema,
  supplierLot: z.string(),
  status: z.enum(LOT_STATUSES),
});

export const loadedContainerSchema = z.object({
  id: idSchema,
  code: z.string(),
  lotId: idSchema,
  quantity: z.number(),
  remaining: z.number(),
  status: z.enum(CONTAINER_STATUSES),
  openedAt: instantSchema.nullable(),
});

export const loadedMixSchema = z.object({
  id: idSchema,
  code: z.string(),
  remaining: z.number(),
  status: z.enum(MIX_STATUSES),
  mixedAt: instantSchema,
  potLifeEndsAt: instantSchema,
});

/** One thing loaded at a station for a batch, with its effective expiry for a live countdown. */
export const stationLoadSchema = z.object({
  id: idSchema,
  stationId: idSchema,
  batchId: idSchema,
  batchCode: z.string(),
  loadedAt: instantSchema,
  loadedBy: idSchema.nullable(),
  container: loadedContainerSchema.nullable(),
  mix: loadedMixSchema.nullable(),
  /** The container's lot, or the mix's resin lot. */
  lot: loadedLotSchema,
  /** A mix's other part (hardener or activator), so its hazards show too; null for a container. */
  partMaterial: loadedMaterialSchema.nullable(),
  /** The lot of a mix's other part (the hardener's lot), so the station shows both lots; null for a container. */
  partLot: loadedLotSchema.nullable(),
  /** The container's material, or the mix's resin material. */
  material: loadedMaterialSchema,
  expiresAt: instantSchema.nullable(),
  expiryCause: expiryCauseSchema.nullable(),
});
export type StationLoad = z.infer<typeof stationLoadSchema>;

/** 200 answer of POST /api/stations/:id/load. */
export const loadResultSchema = stationLoadSchema.extend({
  accepted: z.literal(true),
  /** The recipe step of the batch this load is for. */
  step: z.object({ id: idSchema, seq: z.number().int(), name: z.string() }),
  /** True when this load opened a sealed container (after-opening life starts now). */
  opened: z.boolean(),
  /** True when the same container/mix was already loaded here for the batch (nothing changed). */
  alreadyLoaded: z.boolean(),
});
export type LoadResult = z.infer<typeof loadResultSchema>;

/** GET /api/stations/:id/loaded */
export const stationLoadedQuerySchema = z.object({ batchId: idSchema.optional() });
export const stationLoadedSchema = z.object({ items: z.array(stationLoadSchema), now: instantSchema });
export type StationLoaded = z.infer<typeof stationLoadedSchema>;

/** POST /api/stations/:id/unload: one load by id, or by the scanned code (optionally for one batch). */
export const unloadInputSchema = z
  .object({
    loadId: idSchema.optional(),
    containerCode: scannedCode.optional(),
    mixCode: scannedCode.optional(),
    batchId: idSchema.optional(),
  })
  .superRefine((v, ctx) => {
    const given = [v.loadId, v.containerCode, v.mixCode].filter(Boolean).length;
    if (given !== 1) ctx.addIssue({ code: 'custom', path: ['loadId'], message: 'or containerCode or mixCode: give exactly one' });
  });
export type UnloadInput = z.infer<typeof unloadInputSchema>;

export const unloadResultSchema = z.object({ unloaded: z.array(idSchema) });
export type UnloadResult = z.infer<typeof unloadResultSchema>;
