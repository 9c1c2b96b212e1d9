import type { RouteRecordRaw } from 'vue-router';

/** Receiving dock: receive lots, print their labels, look up scanned codes. */
export const receivingRoutes: RouteRecordRaw[] = [
  {
    path: 'receiving',
    name: 'receiving.new',
    component: () => import('@/pages/receiving/ReceivePage.vue'),
    meta: { permission: 'lots.receive', title: 'Receive a lot' },
  },
  {
    path: 'labels',
    name: 'labels.print',
    component: () => import('@/pages/labels/LabelsPage.vue'),
    meta: { permission: 'labels.print', title: 'Labels' },
  },
  {
    path: 'scan',
    name: 'scan.lookup',
    component: () => import('@/pages/scan/ScanPage.vue'),
    meta: { title: 'Scan' },
  },
];
