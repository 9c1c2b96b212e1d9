import { z } from 'zod';
import { ALERT_SEVERITIES, LOT_STATUSES } from '../constants';
import { idSchema, instantSchema } from './common';
import { stockTodaySchema } from './stock';
import { auditVerifyResultSchema } from './audit';

/**
 * GET /api/home: the figures of the signed-in person's day, one section per role they hold
 * (and may see: the `home.<role>` actions of the permission map). A section the caller may not
 * see is absent, not empty.
 */
export const homeQuerySchema = z.object({
  /** The station this device is set to (the station screen remembers it); else the person's last station. */
  stationId: idSchema.optional(),
});
export type HomeQuery = z.infer<typeof homeQuerySchema>;

/** The plant day the "today" figures count: [start, end) in UTC, and its date in the plant's zone. */
export const plantDaySchema = z.object({ date: z.string(), start: instantSchema, end: instantSchema });

/** Lots on hold awaiting incoming inspection. */
export const onHoldFiguresSchema = z.object({
  count: z.number().int().nonnegative(),
  /** When the longest-waiting lot on hold was received (null when none is on hold). */
  oldestReceivedAt: instantSchema.nullable(),
  oldestLotId: idSchema.nullable(),
});

export const homeReceivingSchema = z.object({
  receivedToday: z.object({
    lots: z.number().int().nonnegative(),
    containers: z.number().int().nonnegative(),
    /** The latest received today, newest first (at most a handful). */
    latest: z.array(
      z.object({
        lotId: idSchema,
        supplierLot: z.string(),
        materialCode: z.string(),
        materialName: z.string(),
        status: z.enum(LOT_STATUSES),
        receivedAt: instantSchema,
        containers: z.number().int().nonnegative(),
      }),
    ),
  }),
  onHold: onHoldFiguresSchema,
});

export const stationBatchStateSchema = z.enum(['running', 'loaded', 'finished']);
export type StationBatchState = z.infer<typeof stationBatchStateSchema>;

export const homeAssemblerSchema = z.object({
  station: z
    .object({
      id: idSchema,
      code: z.string(),
      name: z.string(),
      kind: z.string(),
      area: z.string(),
      /** 'device': the station this device is set to; 'last-activity': where this person last scanned or ran a step. */
      source: z.enum(['device', 'last-activity']),
    })
    .nullable(),
  /** The batch at that station now: a step running, containers loaded for it, or the last step finished there. */
  batch: z
    .object({
      id: idSchema,
      code: z.string(),
      modelCode: z.string(),
      quantity: z.number().int(),
      state: stationBatchStateSchema,
      step: z.object({ id: idSchema, seq: z.number().int(), name: z.string() }).nullable(),
      /** running: when the step started; loaded: when the first container was loaded; finished: when it finished. */
      since: instantSchema,
      loadedCount: z.number().int().nonnegative(),
      /** finished: when the adhesive of that step is fully cured (null when it needs no cure). */
      cureCompleteAt: instantSchema.nullable(),
    })
    .nullable(),
  curesEndingSoon: z.object({
    withinHours: z.number(),
    /** Every cure still running that ends within the window (the list below shows the first few). */
    count: z.number().int().nonnegative(),
    items: z.array(
      z.object({
        stepRunId: idSchema,
        batchId: idSchema,
        batchCode: z.string(),
        stepName: z.string(),
        stationCode: z.string(),
        cureCompleteAt: instantSchema,
      }),
    ),
  }),
});

export const homeQualitySchema = z.object({
  /** Live alerts (open or acknowledged, not resolved) meant for the caller's roles, per severity. */
  alerts: z.array(
    z.object({
      severity: z.enum(ALERT_SEVERITIES),
      live: z.number().int().nonnegative(),
      /** Of those, not yet acknowledged by anyone. */
      unacknowledged: z.number().int().nonnegative(),
    }),
  ),
  onHold: onHoldFiguresSchema,
  failuresToday: z.object({
    /** Final tests failed in the plant day. */
    failed: z.number().int().nonnegative(),
    /** Final tests recorded in the plant day, passed or failed. */
    tested: z.number().int().nonnegative(),
  }),
  /** Live "quarantine advised" alerts: lots the statistics or a notice say to quarantine. */
  quarantineAdvised: z.number().int().nonnegative(),
});

/** A verification of the audit chain and when it ran. */
export const auditCheckSchema = auditVerifyResultSchema.extend({ at: instantSchema });
export type AuditCheck = z.infer<typeof auditCheckSchema>;

export const homeAdminSchema = z.object({
  users: z.object({ active: z.number().int().nonnegative(), total: z.number().int().nonnegative() }),
  stations: z.object({ active: z.number().int().nonnegative(), total: z.number().int().nonnegative() }),
  /** The last verification of the audit chain (the compliance watch's daily check, or a person's Verify); null before the first. */
  auditChain: z.object({
    lastCheck: auditCheckSchema.nullable(),
    /** Audit entries written since that check (not yet verified); null before the first check. */
    sinceLastCheck: z.number().int().nonnegative().nullable(),
  }),
});

export const homeFiguresSchema = z.object({
  now: instantSchema,
  zone: z.string(),
  day: plantDaySchema,
  receiving: homeReceivingSchema.optional(),
  assembler: homeAssemblerSchema.optional(),
  quality: homeQualitySchema.optional(),
  purchasing: stockTodaySchema.optional(),
  admin: homeAdminSchema.optional(),
});
export type HomeFigures = z.infer<typeof homeFiguresSchema>;
export type HomeReceiving = z.infer<typeof homeReceivingSchema>;
export type HomeAssembler = z.infer<typeof homeAssemblerSchema>;
export type HomeQuality = z.infer<typeof homeQualitySchema>;
export type HomeAdmin = z.infer<typeof homeAdminSchema>;
export type OnHoldFigures = z.infer<typeof onHoldFiguresSchema>;
