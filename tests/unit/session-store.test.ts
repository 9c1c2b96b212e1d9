import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { z } from 'zod';
import type { SessionUser } from '../../shared/schemas/auth';
import { permissionsFor } from '../../shared/permissions';
import * as authApi from '@/api/auth';
import { ApiError, apiFetch } from '@/api/http';
import { useSessionStore } from '@/stores/session';

// The store may only talk to the server through src/api/auth, mocked here.
vi.mock('@/api/auth', () => ({ login: vi.fn(), logout: vi.fn(), me: vi.fn() }));
const api = vi.mocked(authApi);

const quality: SessionUser = {
  id: '3f0b8c1e-6a57-4c4e-9d0e-2b7f6f4f8a11',
  email: 'quality@tacklog.test',
  name: 'Tomas Ferreira (quality)',
  roles: ['quality'],
  permissions: permissionsFor(['quality']),
};
const notSignedIn = () => new ApiError(401, 'NOT_SIGNED_IN', 'Sign in to continue.');

/** Resolves later, so two callers can overlap. */
function deferred<T>() {
  let resolve!: (value: T) => void;
  let reject!: (err: unknown) => void;
  const promise = new Promise<T>((res, rej) => {
    resolve = res;
    reject = rej;
  });
  return { promise, resolve, reject };
}

let unexpectedRequests: string[] = [];

beforeEach(() => {
  setActivePinia(createPinia());
  vi.resetAllMocks();
  // Any request the test did not plan for is recorded, fails, and fails the test afterwards.
  unexpectedRequests = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: unknown) => {
      unexpectedRequests.push(String(input));
      throw new Error(`unexpected request: ${String(input)}`);
    }),
  );
});

afterEach(() => {
  vi.unstubAllGlobals();
  expect(unexpectedRequests).toEqual([]);
});

describe('load', () => {
  it('asks the server once, sharing one in-flight request between callers', async () => {
    const pending = deferred<SessionUser>();
    api.me.mockReturnValueOnce(pending.promise);
    const session = useSessionStore();

    const first = session.load();
    const second = session.load();
    expect(api.me).toHaveBeenCalledTimes(1);
    expect(session.loaded).toBe(false);

    pending.resolve(quality);
    await expect(first).resolves.toEqual(quality);
    await expect(second).resolves.toEqual(quality);
    expect(session.user).toEqual(quality);
    expect(session.loaded).toBe(true);

    // Already known: no second request.
    await expect(session.load()).resolves.toEqual(quality);
    expect(api.me).toHaveBeenCalledTimes(1);
  });

  it('treats 401 as "nobody signed in" without failing', async () => {
    api.me.mockRejectedValueOnce(notSignedIn());
    const session = useSessionStore();
    await expect(session.load()).resolves.toBeNull();
    expect(session.user).toBeNull();
    expect(session.signedIn).toBe(false);
    expect(session.loaded).toBe(true);
  });

  it('passes other failures on and tries again on the next load', async () => {
    api.me.mockRejectedValueOnce(new ApiError(0, 'NETWORK', 'The Tacklog server could not be reached.'));
    api.me.mockResolvedValueOnce(quality);
    const session = useSessionStore();
    await expect(session.load()).rejects.toMatchObject({ code: 'NETWORK' });
    expect(session.loaded).toBe(false);
    await expect(session.load()).resolves.toEqual(quality);
    expect(api.me).toHaveBeenCalledTimes(2);
  });
});

describe('signIn and signOut', () => {
  it('signs in with the given e-mail and password and keeps the user', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    expect(api.login).toHaveBeenCalledWith({ email: 'quality@tacklog.test', password: 'tacklog-demo' });
    expect(session.user).toEqual(quality);
    expect(session.roles).toEqual(['quality']);
    expect(session.loaded).toBe(true);
    // Signed in: load() does not ask again.
    await session.load();
    expect(api.me).not.toHaveBeenCalled();
  });

  it('stays signed out when the password is wrong', async () => {
    api.login.mockRejectedValueOnce(new ApiError(401, 'BAD_CREDENTIALS', 'The e-mail or password is not right.'));
    const session = useSessionStore();
    await expect(session.signIn('quality@tacklog.test', 'nope')).rejects.toMatchObject({ status: 401, code: 'BAD_CREDENTIALS' });
    expect(session.user).toBeNull();
  });

  it('signs out: the server clears the cookie, the store drops the user', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    api.logout.mockResolvedValueOnce(undefined);
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    await session.signOut();
    expect(api.logout).toHaveBeenCalledTimes(1);
    expect(session.user).toBeNull();
    expect(session.roles).toEqual([]);
    expect(session.can('lots.release')).toBe(false);
  });

  it('counts a sign-out of an already ended session as signed out', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    api.logout.mockRejectedValueOnce(notSignedIn());
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    await expect(session.signOut()).resolves.toBeUndefined();
    expect(session.user).toBeNull();
  });

  it('keeps the user when the server could not be told (the cookie would still be valid)', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    api.logout.mockRejectedValueOnce(new ApiError(0, 'NETWORK', 'The Tacklog server could not be reached.'));
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    await expect(session.signOut()).rejects.toMatchObject({ code: 'NETWORK' });
    expect(session.user).toEqual(quality);
  });
});

describe('permissions', () => {
  it('can() answers from the permissions the server sent, any of several actions, false when signed out', async () => {
    // What the server sends for someone holding quality and purchasing (the one permission map).
    api.login.mockResolvedValueOnce({
      token: 'opaque',
      user: { ...quality, roles: ['quality', 'purchasing'], permissions: permissionsFor(['quality', 'purchasing']) },
    });
    const session = useSessionStore();
    expect(session.can('lots.release')).toBe(false);

    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    expect(session.can('lots.release')).toBe(true);
    expect(session.can('suppliers.edit')).toBe(true);
    expect(session.can('lots.receive')).toBe(false);
    expect(session.can('users.manage')).toBe(false);
    expect(session.can('users.manage', 'lots.receive')).toBe(false);
    expect(session.can('users.manage', 'suppliers.edit')).toBe(true);
    expect(session.can()).toBe(false);
  });

  it("trusts the server's list, not the roles: an action the server did not send is refused", async () => {
    api.me.mockResolvedValueOnce({ ...quality, roles: ['admin'], permissions: ['lots.readHistory'] });
    const session = useSessionStore();
    await session.load();
    expect(session.can('lots.readHistory')).toBe(true);
    expect(session.can('users.manage')).toBe(false);
  });

  it('exposes the user read-only', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    (session as unknown as { user: SessionUser | null }).user = null;
    warn.mockRestore();
    expect(session.user).toEqual(quality);
  });
});

describe('session end', () => {
  it('drops the user when any API call answers 401', async () => {
    api.login.mockResolvedValueOnce({ token: 'opaque', user: quality });
    const session = useSessionStore();
    await session.signIn('quality@tacklog.test', 'tacklog-demo');

    // The one request this test expects: a lot list whose session has expired.
    vi.stubGlobal(
      'fetch',
      vi.fn(async (input: unknown) => {
        expect(String(input)).toBe('/api/lots');
        return new Response(JSON.stringify({ error: { code: 'NOT_SIGNED_IN', message: 'Sign in to continue.' } }), {
          status: 401,
          headers: { 'Content-Type': 'application/json' },
        });
      }),
    );
    await expect(apiFetch('/api/lots', { schema: z.object({ items: z.array(z.unknown()) }) })).rejects.toMatchObject({
      status: 401,
      code: 'NOT_SIGNED_IN',
    });
    expect(session.user).toBeNull();
  });
});
