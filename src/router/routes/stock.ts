import type { RouteRecordRaw } from 'vue-router';

/** Stock, days of cover and the expiry outlook: whoever the permission map allows `stock.read`. */
export const stockRoutes: RouteRecordRaw[] = [
  {
    path: 'stock',
    name: 'stock.overview',
    component: () => import('@/pages/stock/StockPage.vue'),
    meta: { title: 'Stock & expiry', permission: 'stock.read' },
  },
  {
    path: 'stock/outlook',
    name: 'stock.outlook',
    component: () => import('@/pages/stock/StockOutlookPage.vue'),
    meta: { title: 'Expiry outlook', permission: 'stock.read' },
  },
  {
    path: 'stock/materials/:id',
    name: 'stock.material',
    component: () => import('@/pages/stock/StockMaterialPage.vue'),
    props: true,
    meta: { title: 'Stock of a material', permission: 'stock.read' },
  },
];
