import type { RouteRecordRaw } from 'vue-router';

/**
 * Alerts of the compliance watch. The drawer offers it to quality, admin and purchasing; any
 * signed-in user may open it and sees the alerts meant for their roles (the server decides).
 */
export const alertsRoutes: RouteRecordRaw[] = [
  {
    path: 'alerts',
    name: 'alerts.list',
    component: () => import('@/pages/alerts/AlertsPage.vue'),
    meta: { title: 'Alerts' },
  },
];
