import type { RouteRecordRaw } from 'vue-router';

/** Outside the layout: reachable without signing in. */
export const publicRoutes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'auth.signin',
    component: () => import('@/pages/auth/SignInPage.vue'),
    meta: { public: true, title: 'Sign in' },
  },
];

/** Inside the layout, for anyone signed in. */
export const homeRoutes: RouteRecordRaw[] = [
  { path: '', name: 'home', component: () => import('@/pages/home/HomePage.vue'), meta: { title: 'Home' } },
];

/** Last child of the layout: any path no route claims. */
export const notFoundRoute: RouteRecordRaw = {
  path: ':pathMatch(.*)*',
  name: 'notfound',
  component: () => import('@/pages/NotFoundPage.vue'),
  meta: { title: 'Not found' },
};
