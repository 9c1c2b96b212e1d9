import type { RouteRecordRaw } from 'vue-router';

/** Lots and their containers (anyone signed in may look; each action checks its permission). */
export const lotsRoutes: RouteRecordRaw[] = [
  {
    path: 'lots',
    name: 'lots.list',
    component: () => import('@/pages/lots/LotsPage.vue'),
    meta: { title: 'Lots' },
  },
  {
    path: 'lots/:id',
    name: 'lots.detail',
    component: () => import('@/pages/lots/LotDetailPage.vue'),
    props: true,
    meta: { title: 'Lot' },
  },
];
