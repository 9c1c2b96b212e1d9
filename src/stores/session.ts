import { computed, ref, type DeepReadonly } from 'vue';
import { defineStore } from 'pinia';
import type { Role } from '@shared/constants';
import type { User } from '@shared/schemas/auth';
import { can as rolesCan, type Action } from '@shared/permissions';
import * as authApi from '@/api/auth';
import { ApiError, onUnauthorized } from '@/api/http';

/**
 * Who is signed in. The httpOnly cookie set by the server is the browser session, so the
 * store keeps only the user; it never shows notifications (pages do).
 */
export const useSessionStore = defineStore('session', () => {
  const current = ref<User | null>(null);
  /** True once the server has said who (if anyone) is signed in. */
  const loaded = ref(false);
  let inFlight: Promise<DeepReadonly<User> | null> | null = null;

  const user = computed<DeepReadonly<User> | null>(() => current.value);
  const roles = computed<readonly Role[]>(() => current.value?.roles ?? []);
  const signedIn = computed(() => current.value !== null);

  function setUser(next: User | null) {
    current.value = next;
    loaded.value = true;
  }

  // Any 401 from any API call means the session is gone (expired, signed out elsewhere).
  onUnauthorized(() => {
    if (current.value) current.value = null;
  });

  /** Asks the server once who is signed in; concurrent callers share one request. */
  function load(): Promise<DeepReadonly<User> | null> {
    if (loaded.value) return Promise.resolve(current.value);
    if (!inFlight) {
      inFlight = authApi
        .me()
        .then(
          (me) => {
            setUser(me);
            return current.value;
          },
          (err: unknown) => {
            if (err instanceof ApiError && err.status === 401) {
              setUser(null);
              return null;
            }
            throw err;
          },
        )
        .finally(() => {
          inFlight = null;
        });
    }
    return inFlight;
  }

  async function signIn(email: string, password: string): Promise<DeepReadonly<User>> {
    const result = await authApi.login({ email, password });
    setUser(result.user);
    return result.user;
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.logout();
    } catch (err) {
      // A 401 means the session had already ended: the user is signed out either way.
      if (!(err instanceof ApiError && err.status === 401)) throw err;
    }
    setUser(null);
  }

  /** True when the user holds at least one of `wanted` (or is signed in, when none is given). */
  function hasRole(...wanted: Role[]): boolean {
    if (!current.value) return false;
    if (wanted.length === 0) return true;
    return wanted.some((role) => current.value?.roles.includes(role));
  }

  /**
   * Whether the user may do an action of the permission map: the server's list from
   * /api/auth/me when it sent one, else the same map applied to the user's roles.
   */
  function can(action: Action): boolean {
    const u = current.value as (User & { permissions?: string[] }) | null;
    if (!u) return false;
    return Array.isArray(u.permissions) ? u.permissions.includes(action) : rolesCan(u.roles, action);
  }

  return { user, loaded: computed(() => loaded.value), roles, signedIn, load, signIn, signOut, hasRole, can };
});
