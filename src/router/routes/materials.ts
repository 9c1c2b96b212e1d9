import type { RouteRecordRaw } from 'vue-router';

/** Catalogue: materials and suppliers (administrators keep them). */
export const materialsRoutes: RouteRecordRaw[] = [
  {
    path: 'catalogue/materials',
    name: 'catalogue.materials',
    component: () => import('@/pages/catalogue/MaterialsPage.vue'),
    meta: { permission: 'materials.edit', title: 'Materials' },
  },
  {
    path: 'catalogue/materials/new',
    name: 'catalogue.materials.new',
    component: () => import('@/pages/catalogue/MaterialEditPage.vue'),
    meta: { permission: 'materials.edit', title: 'New material' },
  },
  {
    path: 'catalogue/materials/:id',
    name: 'catalogue.materials.edit',
    component: () => import('@/pages/catalogue/MaterialEditPage.vue'),
    props: true,
    meta: { permission: 'materials.edit', title: 'Material' },
  },
  {
    path: 'catalogue/suppliers',
    name: 'catalogue.suppliers',
    component: () => import('@/pages/catalogue/SuppliersPage.vue'),
    meta: { permission: 'suppliers.edit', title: 'Suppliers' },
  },
];
