import { computed, ref, type DeepReadonly } from 'vue';
import { defineStore } from 'pinia';
import type { Role } from '@shared/constants';
import type { Action } from '@shared/permissions';
import type { SessionUser } from '@shared/schemas/auth';
import * as authApi from '@/api/auth';
import { ApiError, onUnauthorized } from '@/api/http';

/**
 * Who is signed in and what they may do. The httpOnly cookie set by the server is the browser
 * session, so the store keeps only the user, with the actions the server's permission map
 * allows them (`user.permissions`, from sign-in and from GET /api/auth/me). Pages, the router
 * and the navigation ask `can(action)`; the server checks every request again. The store never
 * shows notifications (pages do).
 */
export const useSessionStore = defineStore('session', () => {
  const current = ref<SessionUser | null>(null);
  /** True once the server has said who (if anyone) is signed in. */
  const loaded = ref(false);
  let inFlight: Promise<DeepReadonly<SessionUser> | null> | null = null;

  const user = computed<DeepReadonly<SessionUser> | null>(() => current.value);
  /** The roles held, for saying who someone is (role chips, greetings); decisions use `can`. */
  const roles = computed<readonly Role[]>(() => current.value?.roles ?? []);
  const permissions = computed<ReadonlySet<string>>(() => new Set(current.value?.permissions ?? []));
  const signedIn = computed(() => current.value !== null);

  function setUser(next: SessionUser | null) {
    current.value = next;
    loaded.value = true;
  }

  // Any 401 from any API call means the session is gone (expired, signed out elsewhere).
  onUnauthorized(() => {
    if (current.value) current.value = null;
  });

  /** Asks the server once who is signed in; concurrent callers share one request. */
  function load(): Promise<DeepReadonly<SessionUser> | null> {
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

  async function signIn(email: string, password: string): Promise<DeepReadonly<SessionUser>> {
    const result = await authApi.login({ email, password });
    setUser(result.user);
    return result.user;
  }

  /** Asks the server again who is signed in (after a change to one's own account, e.g. a new password). */
  async function refresh(): Promise<DeepReadonly<SessionUser> | null> {
    loaded.value = false;
    return load();
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

  /**
   * Whether the signed-in user may do `action` (one of the permission map's actions), as the
   * server said. With several actions: whether they may do any of them. False when signed out.
   */
  function can(...actions: Action[]): boolean {
    return actions.some((action) => permissions.value.has(action));
  }

  return { user, loaded: computed(() => loaded.value), roles, signedIn, load, refresh, signIn, signOut, can };
});
