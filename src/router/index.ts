import { watch } from 'vue';
import { createRouter, createWebHistory, type RouteLocationNormalized, type RouteRecordRaw, type Router } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { usePlantStore } from '@/stores/plant';
import { safeRedirect } from './redirect';
import { homeRoutes, notAllowedRoute, notFoundRoute, publicRoutes } from './routes/core';
import { productionRoutes } from './routes/production';
import { traceRoutes } from './routes/trace';
import { recipesRoutes } from './routes/recipes';
import { lotsRoutes } from './routes/lots';
import { materialsRoutes } from './routes/materials';
import { receivingRoutes } from './routes/receiving';
import { alertsRoutes } from './routes/alerts';
import { actionsOf } from './meta';
import { stockRoutes } from './routes/stock';
import { mailRoutes } from './routes/mail';
import { oversightRoutes } from './routes/oversight';
import { usersRoutes } from './routes/users';
import MainLayout from '@/layouts/MainLayout.vue';

// ---------------------------------------------------------------------------------------------
// Area routes. Each area keeps its routes in src/router/routes/<area>.ts (lazy components,
// dotted names like 'lots.detail', meta {permission}) and adds ONE import and ONE entry below.
// Route names used by the drawer are listed in src/navigation.ts.
// ---------------------------------------------------------------------------------------------
const areaRoutes: RouteRecordRaw[] = [
  ...homeRoutes,
  ...productionRoutes,
  ...traceRoutes,
  ...recipesRoutes,
  ...lotsRoutes,
  ...materialsRoutes,
  ...receivingRoutes,
  ...alertsRoutes,
  ...stockRoutes,
  ...mailRoutes,
  ...oversightRoutes,
  ...usersRoutes,
];

export const routes: RouteRecordRaw[] = [
  ...publicRoutes,
  {
    path: '/',
    // In the main bundle, not lazy: every signed-in page needs it, and a lazy layout added a
    // round trip before anything showed on a fresh page.
    component: MainLayout,
    children: [...areaRoutes, notAllowedRoute, notFoundRoute],
  },
];

/** Where the guard sends a navigation, or true to let it through. */
export async function guard(to: RouteLocationNormalized) {
  const session = useSessionStore();
  // Every time on screen is plant time: learn the plant's zone once, before the first page.
  await usePlantStore()
    .ensureLoaded()
    .catch((err: unknown) => console.error('[router] could not load the plant settings:', err));
  let user: Awaited<ReturnType<typeof session.load>> = null;
  try {
    user = await session.load();
  } catch (err) {
    // The server could not say who is signed in: the sign-in page will show the problem.
    console.error('[router] could not load the session:', err);
  }

  if (to.meta.public) {
    if (user && to.name === 'auth.signin') return safeRedirect(to.query.redirect) ?? { name: 'home' };
    return true;
  }
  if (!user) {
    return to.fullPath === '/' ? { name: 'auth.signin' } : { name: 'auth.signin', query: { redirect: to.fullPath } };
  }
  // A temporary password opens only the account page, where it is replaced (the server refuses the rest).
  if (user.mustChangePassword && to.name !== 'me.account') return { name: 'me.account' };
  // Not a silent redirect: a page that says so, with a way back (NotAllowedPage).
  if (to.meta.permission && !session.can(...actionsOf(to.meta.permission))) return { name: 'not-allowed', query: { from: to.fullPath } };
  return true;
}

export function createAppRouter(): Router {
  const router = createRouter({
    history: createWebHistory(),
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  });
  router.beforeEach(guard);
  router.afterEach((to) => {
    document.title = to.meta.title ? `${to.meta.title} · Tacklog` : 'Tacklog';
  });
  return router;
}

/**
 * The one place that leaves a signed-in page when the session ends (the sign-out button, an
 * expired session: any 401): go to the sign-in page, and come back to the same place after.
 */
export function followSessionEnd(router: Router): void {
  const session = useSessionStore();
  watch(
    () => session.user,
    (user, previous) => {
      const route = router.currentRoute.value;
      if (user || !previous || route.meta.public) return;
      const query = route.name === 'home' ? {} : { redirect: route.fullPath };
      void router.replace({ name: 'auth.signin', query });
    },
  );
}
