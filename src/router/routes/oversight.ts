import type { RouteRecordRaw } from 'vue-router';

/** Quality and admin oversight: the audit trail and the quality overview (permission map: audit.read, quality.overview). */
export const oversightRoutes: RouteRecordRaw[] = [
  {
    path: 'audit',
    name: 'audit.list',
    component: () => import('@/pages/audit/AuditPage.vue'),
    meta: { title: 'Audit trail', permission: 'audit.read' },
  },
  {
    path: 'quality',
    name: 'quality.overview',
    component: () => import('@/pages/quality/QualityOverviewPage.vue'),
    meta: { title: 'Quality overview', permission: 'quality.overview' },
  },
];
