import { z } from 'zod';
import { ALERT_KINDS, ROLES } from '../constants';
import { NOTIFICATION_MODES } from '../notifications';
import { idSchema } from './common';

export const notificationModeSchema = z.enum(NOTIFICATION_MODES, { message: `must be one of ${NOTIFICATION_MODES.join(', ')}` });

const modesByKind = z.partialRecord(
  z.enum(ALERT_KINDS, { message: `must be an alert kind (${ALERT_KINDS.join(', ')})` }),
  notificationModeSchema,
);

/**
 * GET /api/me/notifications (and /api/users/:id/notifications for an administrator):
 * `kinds` holds the mode in effect for every alert kind; `chosen` what the user set
 * (the rest follows `defaults`, from their roles); `available` the kinds that concern them.
 */
export const notificationSettingsSchema = z.object({
  user: z.object({ id: idSchema, name: z.string(), email: z.string(), roles: z.array(z.enum(ROLES)) }),
  kinds: z.record(z.string(), notificationModeSchema),
  defaults: z.record(z.string(), notificationModeSchema),
  chosen: z.record(z.string(), notificationModeSchema),
  available: z.array(z.enum(ALERT_KINDS)),
  /** E-mail me when an alert I was e-mailed about is resolved. */
  whenResolved: z.boolean(),
});
export type NotificationSettings = z.infer<typeof notificationSettingsSchema>;

/**
 * PUT body: the user's choices per kind (replacing the earlier ones: a kind left out follows
 * the default of the user's roles), and optionally `whenResolved`.
 */
export const notificationSettingsInputSchema = z.strictObject({
  kinds: modesByKind,
  whenResolved: z.boolean({ message: 'must be true or false' }).optional(),
});
export type NotificationSettingsInput = z.infer<typeof notificationSettingsInputSchema>;

export const userNotificationParamsSchema = z.object({ id: idSchema });

export const digestRunResultSchema = z.object({
  /** Digests queued now (0 when today's had all been queued already). */
  sent: z.number().int().nonnegative(),
  /** The plant date they are for. */
  plantDate: z.string(),
  /** Of those, how many the mail server accepted during this request. */
  delivered: z.number().int().nonnegative(),
});
export type DigestRunResult = z.infer<typeof digestRunResultSchema>;
