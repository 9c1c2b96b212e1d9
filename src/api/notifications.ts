import {
  digestRunResultSchema,
  notificationSettingsSchema,
  type DigestRunResult,
  type NotificationSettings,
  type NotificationSettingsInput,
} from '@shared/schemas/notifications';
import { userListSchema, type UserList } from '@shared/schemas/users';
import { apiFetch } from './http';

const path = (userId: string | null) => (userId ? `/api/users/${encodeURIComponent(userId)}/notifications` : '/api/me/notifications');

/** The e-mail choices of the signed-in user (userId null), or of anyone for an administrator. */
export function getNotificationSettings(userId: string | null): Promise<NotificationSettings> {
  return apiFetch(path(userId), { schema: notificationSettingsSchema });
}

export function saveNotificationSettings(userId: string | null, input: NotificationSettingsInput): Promise<NotificationSettings> {
  return apiFetch(path(userId), { method: 'PUT', body: input, schema: notificationSettingsSchema });
}

/** POST /api/notifications/digest (admin): today's digests now. */
export function sendDigestNow(): Promise<DigestRunResult> {
  return apiFetch('/api/notifications/digest', { method: 'POST', schema: digestRunResultSchema });
}

/** GET /api/users (admin): whose settings an administrator can open. */
export function listPeople(): Promise<UserList> {
  return apiFetch('/api/users', { schema: userListSchema });
}
