import type { RouteRecordRaw } from 'vue-router';

/** Administration of the line: stations, driver models and their recipes. */
export const recipesRoutes: RouteRecordRaw[] = [
  {
    path: 'admin/stations',
    name: 'catalogue.stations',
    component: () => import('@/pages/admin/StationsPage.vue'),
    meta: { title: 'Stations', permission: 'stations.edit' },
  },
  {
    path: 'admin/models',
    name: 'catalogue.models',
    component: () => import('@/pages/admin/ModelsPage.vue'),
    meta: { title: 'Driver models', permission: 'models.edit' },
  },
  {
    path: 'admin/models/new',
    name: 'catalogue.models.new',
    component: () => import('@/pages/admin/ModelEditPage.vue'),
    meta: { title: 'New driver model', permission: 'models.edit' },
  },
  {
    path: 'admin/models/:id',
    name: 'catalogue.models.edit',
    component: () => import('@/pages/admin/ModelEditPage.vue'),
    props: true,
    meta: { title: 'Driver model', permission: 'models.edit' },
  },
];
