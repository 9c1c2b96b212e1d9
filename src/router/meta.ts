import type { Role } from '@shared/constants';

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean;
    /** Roles allowed; absent = anyone signed in. The server checks again. */
    roles?: Role[];
    /** Page title shown in the browser tab. */
    title?: string;
  }
}

export {};
