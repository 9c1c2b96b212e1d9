import type { Action } from '@shared/permissions';

/** What a page or menu item needs: one action of the permission map, or any of several. */
export type PermissionNeed = Action | readonly Action[];

/** The actions of a need, as a list for `session.can(...)`. */
export function actionsOf(need: PermissionNeed): Action[] {
  return typeof need === 'string' ? [need] : [...need];
}

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean;
    /**
     * The action (or any of the actions) of the permission map the page is for; absent = anyone
     * signed in. The guard sends others home; the server checks every request again.
     */
    permission?: PermissionNeed;
    /** Page title shown in the browser tab. */
    title?: string;
  }
}
