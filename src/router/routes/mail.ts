import type { RouteRecordRaw } from 'vue-router';

/**
 * The Mailbox (everyone reads the messages sent to them; an administrator all of them) and the
 * notification settings: one's own under one's name, anyone's for an administrator.
 */
export const mailRoutes: RouteRecordRaw[] = [
  {
    path: 'mail',
    name: 'mail.box',
    component: () => import('@/pages/mail/MailboxPage.vue'),
    meta: { title: 'Mailbox' },
  },
  {
    path: 'me/notifications',
    name: 'me.notifications',
    component: () => import('@/pages/account/NotificationSettingsPage.vue'),
    meta: { title: 'Notification settings' },
  },
  {
    path: 'users/:id/notifications',
    name: 'users.notifications',
    component: () => import('@/pages/account/NotificationSettingsPage.vue'),
    meta: { title: 'Notification settings', permission: 'notifications.manageAll' },
  },
];
