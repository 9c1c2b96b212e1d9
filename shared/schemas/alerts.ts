import { z } from 'zod';
import { ALERT_SEVERITIES, ALERT_STATES, ROLES } from '../constants';
import { idSchema, instantSchema, listFormatSchema } from './common';

export const alertSchema = z.object({
  id: idSchema,
  /** pot_life_exceeded | short_cure | expired_in_stock | expiring_soon | quarantine_advised | below_reorder_point | … */
  kind: z.string(),
  severity: z.enum(ALERT_SEVERITIES),
  state: z.enum(ALERT_STATES),
  subjectType: z.string(),
  subjectId: z.string(),
  /** One sentence a person reads in one go. */
  message: z.string(),
  /** The figures behind the message (tests, limits), for a detail line; null when there are none. */
  detail: z.string().nullable(),
  audience: z.array(z.enum(ROLES)),
  data: z.record(z.string(), z.unknown()).nullable(),
  raisedAt: instantSchema,
  acknowledgedAt: instantSchema.nullable(),
  acknowledgedBy: z.string().nullable(),
  /** The name of the person who acknowledged it. */
  acknowledgedByName: z.string().nullable(),
  resolvedAt: instantSchema.nullable(),
  /** Null with a resolvedAt: cleared by the compliance watch when the condition no longer held. */
  resolvedBy: z.string().nullable(),
  resolvedByName: z.string().nullable(),
  resolution: z.string().nullable(),
});
export type Alert = z.infer<typeof alertSchema>;

export const alertListQuerySchema = z.object({
  state: z.enum([...ALERT_STATES, 'live'] as const).optional(),
  kind: z.string().trim().min(1).max(60).optional(),
  severity: z.enum(ALERT_SEVERITIES).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
  format: listFormatSchema,
});
export type AlertListQuery = z.infer<typeof alertListQuerySchema>;

export const alertListSchema = z.object({ items: z.array(alertSchema), total: z.number().int().nonnegative() });

export const alertParamsSchema = z.object({ id: idSchema });

export const alertResolveInputSchema = z.object({
  resolution: z.string().trim().min(5, 'must say what was done (at least 5 characters)').max(2000),
});

export const complianceRunResultSchema = z.object({
  raised: z.number().int().nonnegative(),
  resolved: z.number().int().nonnegative(),
  /** False when another server process held the watch's lock, so this one did nothing. */
  ran: z.boolean(),
});
export type ComplianceRunResult = z.infer<typeof complianceRunResultSchema>;
