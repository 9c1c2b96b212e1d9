import type { RouteRecordRaw } from 'vue-router';

/** Users and roles (administrators) and each person's own account page. */
export const usersRoutes: RouteRecordRaw[] = [
  {
    path: 'users',
    name: 'users.list',
    component: () => import('@/pages/admin/UsersPage.vue'),
    meta: { title: 'Users', permission: 'users.manage' },
  },
  {
    path: 'me/account',
    name: 'me.account',
    component: () => import('@/pages/account/AccountPage.vue'),
    meta: { title: 'Your account' },
  },
];
