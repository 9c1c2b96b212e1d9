import type { RouteRecordRaw } from 'vue-router';
import type { Role } from '@shared/constants';
import { rolesFor } from '@shared/permissions';

/** Stock, days of cover and the expiry outlook: whoever the permission map allows `stock.read`. */
const roles = [...rolesFor('stock.read')] as Role[];

export const stockRoutes: RouteRecordRaw[] = [
  { path: 'stock', name: 'stock.overview', component: () => import('@/pages/stock/StockPage.vue'), meta: { title: 'Stock & expiry', roles } },
  { path: 'stock/outlook', name: 'stock.outlook', component: () => import('@/pages/stock/StockOutlookPage.vue'), meta: { title: 'Expiry outlook', roles } },
  {
    path: 'stock/materials/:id',
    name: 'stock.material',
    component: () => import('@/pages/stock/StockMaterialPage.vue'),
    props: true,
    meta: { title: 'Stock of a material', roles },
  },
];
