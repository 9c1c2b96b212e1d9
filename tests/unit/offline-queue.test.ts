import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/api/http';
import { createOfflineQueue, isTransient, type QueuedAction, type QueueStorage } from '@/composables/useOfflineQueue';

function memoryStorage(): QueueStorage & { data: Map<string, string> } {
  const data = new Map<string, string>();
  return {
    data,
    getItem: (k) => data.get(k) ?? null,
    setItem: (k, v) => void data.set(k, v),
    removeItem: (k) => void data.delete(k),
  };
}

let counter = 0;
const keys = () => `key-${++counter}`;
const offline = () => new ApiError(0, 'NETWORK', 'The Tacklog server could not be reached.');

describe('offline queue', () => {
  it('sends at once when online and reports the answer', async () => {
    const storage = memoryStorage();
    const send = vi.fn(async (a: QueuedAction) => ({ echoed: a.payload }));
    const results: unknown[] = [];
    const q = createOfflineQueue({ storageKey: 'q', send, storage, newKey: keys, onResult: (_a, o) => results.push(o) });
    q.submit('load', { code: 'A' }, 'Load A');
    await q.flush();
    expect(send).toHaveBeenCalledTimes(1);
    expect(results).toEqual([{ ok: true, value: { echoed: { code: 'A' } } }]);
    expect(q.items.value).toHaveLength(0);
    expect(storage.data.has('q')).toBe(false);
  });

  it('keeps actions while the server cannot be reached, persisted, and resends them in order with the same keys', async () => {
    const storage = memoryStorage();
    let reachable = false;
    const sent: string[] = [];
    const send = vi.fn(async (a: QueuedAction) => {
      sent.push(`${a.kind}:${a.key}`);
      if (!reachable) throw offline();
      return a.kind;
    });
    const results: string[] = [];
    const q = createOfflineQueue({ storageKey: 'q', send, storage, newKey: keys, onResult: (a, o) => results.push(`${a.label}:${o.ok}`) });
    const first = q.submit('load', { code: 'A' }, 'Load A');
    await q.flush();
    expect(q.online.value).toBe(false);
    // Known offline: later actions are queued without trying.
    const second = q.submit('start', { step: 1 }, 'Start 1');
    expect(q.items.value.map((a) => a.key)).toEqual([first.key, second.key]);
    expect(JSON.parse(storage.data.get('q')!)).toHaveLength(2);

    // A reload: a new queue over the same storage finds both, in order.
    const again = createOfflineQueue({
      storageKey: 'q',
      send,
      storage,
      newKey: keys,
      onResult: (a, o) => results.push(`${a.label}:${o.ok}`),
    });
    expect(again.items.value.map((a) => a.label)).toEqual(['Load A', 'Start 1']);

    reachable = true;
    await again.flush();
    expect(sent).toEqual([`load:${first.key}`, `load:${first.key}`, `start:${second.key}`]);
    expect(results).toEqual(['Load A:true', 'Start 1:true']);
    expect(again.online.value).toBe(true);
    expect(storage.data.has('q')).toBe(false);
  });

  it('reports a refusal (409) as the result and goes on with the next action', async () => {
    const send = vi.fn(async (a: QueuedAction) => {
      if (a.label === 'bad') throw new ApiError(409, 'WRONG_MATERIAL', 'Wrong material.');
      return 'fine';
    });
    const results: { label: string; code?: string }[] = [];
    const q = createOfflineQueue({
      storageKey: 'q',
      send,
      storage: memoryStorage(),
      newKey: keys,
      initiallyOnline: false,
      onResult: (a, o) => results.push({ label: a.label, code: o.ok ? undefined : o.error.code }),
    });
    q.submit('load', {}, 'bad');
    q.submit('load', {}, 'good');
    expect(send).not.toHaveBeenCalled();
    await q.flush();
    expect(results).toEqual([
      { label: 'bad', code: 'WRONG_MATERIAL' },
      { label: 'good', code: undefined },
    ]);
  });

  it('stops at a 401 and waits for an explicit flush (signing in again)', async () => {
    let signedIn = false;
    const send = vi.fn(async () => {
      if (!signedIn) throw new ApiError(401, 'NOT_SIGNED_IN', 'Sign in.');
      return 'ok';
    });
    const q = createOfflineQueue({ storageKey: 'q', send, storage: memoryStorage(), newKey: keys });
    q.submit('load', {}, 'A');
    await q.flush();
    expect(q.pausedForSignIn.value).toBe(true);
    expect(q.items.value).toHaveLength(1);
    signedIn = true;
    await q.flush();
    expect(q.items.value).toHaveLength(0);
    expect(q.pausedForSignIn.value).toBe(false);
  });

  it('runs one flush at a time (no action is sent twice concurrently)', async () => {
    let release: () => void = () => undefined;
    const send = vi.fn(
      () =>
        new Promise((resolve) => {
          release = () => resolve('ok');
        }),
    );
    const q = createOfflineQueue({ storageKey: 'q', send, storage: memoryStorage(), newKey: keys, initiallyOnline: false });
    q.submit('load', {}, 'A');
    const a = q.flush();
    const b = q.flush();
    expect(a).toBe(b);
    await Promise.resolve();
    release();
    await a;
    expect(send).toHaveBeenCalledTimes(1);
  });

  it('makes a fresh UUID key per action by default (crypto.randomUUID)', () => {
    const q = createOfflineQueue({ storageKey: 'q', send: async () => 'ok', storage: memoryStorage(), initiallyOnline: false });
    const a = q.submit('load', {}, 'A');
    const b = q.submit('load', {}, 'B');
    // RFC 9562 (UUID version 4): xxxxxxxx-xxxx-4xxx-[89ab]xxx-xxxxxxxxxxxx
    expect(a.key).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(a.key).not.toBe(b.key);
  });

  it('ignores an unreadable stored queue instead of failing', () => {
    const storage = memoryStorage();
    storage.setItem('q', '{not json');
    const spy = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const q = createOfflineQueue({ storageKey: 'q', send: async () => 'ok', storage });
    expect(q.items.value).toEqual([]);
    expect(spy).toHaveBeenCalled();
    spy.mockRestore();
  });

  it('takes no answer (network, gateway 502/503/504) as transient and a 500 or 409 as an answer', () => {
    expect(isTransient(offline())).toBe(true);
    expect(isTransient(new ApiError(503, 'HTTP_ERROR', 'x'))).toBe(true);
    expect(isTransient(new ApiError(500, 'INTERNAL', 'x'))).toBe(false);
    expect(isTransient(new ApiError(409, 'EXPIRED', 'x'))).toBe(false);
    expect(isTransient(new Error('x'))).toBe(false);
  });
});
