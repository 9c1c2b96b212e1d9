import type { RouteRecordRaw } from 'vue-router';

/** Catalogue: materials and suppliers (administrators keep them). */
export const materialsRoutes: RouteRecordRaw[] = [
  {
    path: 'catalogue/materials',
    name: 'catalogue.materials',
    component: () => import('@/pages/catalogue/MaterialsPage.vue'),
    meta: { roles: ['admin'], title: 'Materials' },
  },
  {
    path: 'catalogue/materials/new',
    name: 'catalogue.materials.new',
    component: () => import('@/pages/catalogue/MaterialEditPage.vue'),
    meta: { roles: ['admin'], title: 'New material' },
  },
  {
    path: 'catalogue/materials/:id',
    name: 'catalogue.materials.edit',
    component: () => import('@/pages/catalogue/MaterialEditPage.vue'),
    props: true,
    meta: { roles: ['admin'], title: 'Material' },
  },
  {
    path: 'catalogue/suppliers',
    name: 'catalogue.suppliers',
    component: () => import('@/pages/catalogue/SuppliersPage.vue'),
    meta: { roles: ['admin', 'purchasing'], title: 'Suppliers' },
  },
];
