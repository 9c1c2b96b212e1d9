import type { RouteRecordRaw } from 'vue-router';

/** On the floor: the station screen, batches and their travelers, the cure board, final test, shop readings. */
export const productionRoutes: RouteRecordRaw[] = [
  {
    path: 'station',
    name: 'station.work',
    component: () => import('@/pages/station/StationPage.vue'),
    meta: { title: 'Station', permission: 'steps.run' },
  },
  {
    path: 'batches',
    name: 'batches.list',
    component: () => import('@/pages/batches/BatchesPage.vue'),
    meta: { title: 'Batches', permission: 'batches.create' },
  },
  {
    path: 'batches/:id',
    name: 'batches.detail',
    component: () => import('@/pages/batches/BatchDetailPage.vue'),
    meta: { title: 'Traveler' },
  },
  {
    path: 'cure',
    name: 'cure.board',
    component: () => import('@/pages/cure/CureBoardPage.vue'),
    meta: { title: 'Cure board', permission: ['steps.run', 'deviations.record'] },
  },
  {
    path: 'final-test',
    name: 'tests.final',
    component: () => import('@/pages/testing/FinalTestPage.vue'),
    meta: { title: 'Final test', permission: 'tests.record' },
  },
  {
    path: 'readings',
    name: 'readings.list',
    component: () => import('@/pages/readings/ReadingsPage.vue'),
    meta: { title: 'Shop conditions', permission: 'readings.record' },
  },
];
