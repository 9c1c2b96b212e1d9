import { Router } from 'express';
import { notificationSettingsInputSchema, userNotificationParamsSchema } from '../../shared/schemas/notifications';
import { endpoint } from '../http';
import { getNotificationSettings, putNotificationSettings } from '../services/notifications/settings';
import { sendDigestsNow } from '../services/notifications/send-digest';

/** The signed-in user's own e-mail choices: /api/me/notifications. */
export const meRouter = Router();

meRouter.get(
  '/notifications',
  endpoint({ access: 'signed-in' }, ({ actor }) => getNotificationSettings(actor, actor.id)),
);

meRouter.put(
  '/notifications',
  endpoint({ access: 'signed-in', body: notificationSettingsInputSchema }, ({ actor, body }) =>
    putNotificationSettings(actor, actor.id, body),
  ),
);

/** Anyone's e-mail choices, for an administrator: /api/users/:id/notifications. */
export const userNotificationsRouter = Router();

userNotificationsRouter.get(
  '/:id/notifications',
  endpoint({ access: 'notifications.manageAll', params: userNotificationParamsSchema }, ({ actor, params }) =>
    getNotificationSettings(actor, params.id),
  ),
);

userNotificationsRouter.put(
  '/:id/notifications',
  endpoint(
    { access: 'notifications.manageAll', params: userNotificationParamsSchema, body: notificationSettingsInputSchema },
    ({ actor, params, body }) => putNotificationSettings(actor, params.id, body),
  ),
);

/** POST /api/notifications/digest: today's digests now (a second call the same day sends nothing new). */
export const notificationsRouter = Router();

notificationsRouter.post(
  '/digest',
  endpoint({ access: 'notifications.sendDigest' }, ({ actor }) => sendDigestsNow(actor)),
);
