import type { RouteRecordRaw } from 'vue-router';

/** Genealogy traces: any signed-in user may look (the drawer offers them to quality). */
export const traceRoutes: RouteRecordRaw[] = [
  { path: 'trace', name: 'trace.search', component: () => import('@/pages/trace/TracePage.vue'), meta: { title: 'Trace' } },
  {
    path: 'trace/drivers/:serial',
    name: 'trace.driver',
    component: () => import('@/pages/trace/DriverTracePage.vue'),
    props: true,
    meta: { title: 'Driver trace' },
  },
  {
    path: 'trace/lots/:id',
    name: 'trace.lot',
    component: () => import('@/pages/trace/LotTracePage.vue'),
    props: true,
    meta: { title: 'Lot trace' },
  },
];
