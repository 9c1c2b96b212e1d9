import type { RouteRecordRaw } from 'vue-router';

/** Outside the layout: reachable without signing in. */
export const publicRoutes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'auth.signin',
    component: () => import('@/pages/auth/SignInPage.vue'),
    meta: { public: true, title: 'Sign in' },
  },
  {
    // The page an e-mailed one-time reset link opens (?token=…).
    path: '/reset-password',
    name: 'auth.reset',
    component: () => import('@/pages/auth/ResetPasswordPage.vue'),
    meta: { public: true, title: 'Set a new password' },
  },
];

/** Inside the layout, for anyone signed in. */
export const homeRoutes: RouteRecordRaw[] = [
  { path: '', name: 'home', component: () => import('@/pages/home/HomePage.vue'), meta: { title: 'Home' } },
];

/** Where the guard sends a signed-in person whose roles may not open a page (`from`: that page). */
export const notAllowedRoute: RouteRecordRaw = {
  path: 'not-allowed',
  name: 'not-allowed',
  component: () => import('@/pages/NotAllowedPage.vue'),
  meta: { title: 'No access' },
};

/** Last child of the layout: any path no route claims. */
export const notFoundRoute: RouteRecordRaw = {
  path: ':pathMatch(.*)*',
  name: 'notfound',
  component: () => import('@/pages/NotFoundPage.vue'),
  meta: { title: 'Not found' },
};
