import { getCurrentScope, onScopeDispose, readonly, ref, type Ref } from 'vue';
import { ApiError, errorText } from '@/api/http';

/**
 * A station that loses its network keeps working: every action is queued in the browser
 * (persisted, so a reload keeps it), each with an Idempotency-Key made once when it is queued,
 * and sent strictly in order when the server can be reached again. A resend after a lost answer
 * carries the same key, so the server applies it once and returns the first answer.
 */

export interface QueuedAction<P = unknown> {
  /** The Idempotency-Key (crypto.randomUUID), made once when the action is queued. */
  key: string;
  /** What to do, e.g. 'load', 'start'; the sender maps it to an API call. */
  kind: string;
  payload: P;
  /** What the person sees in the queue, e.g. "Load TLC-4D7QX2MB9". */
  label: string;
  queuedAt: string;
  attempts: number;
}

/** What came back for a queued action: the server's answer, or its refusal. */
export type QueueOutcome = { ok: true; value: unknown } | { ok: false; error: ApiError };

/** The parts of the Web Storage API the queue uses (localStorage in the browser). */
export interface QueueStorage {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

export interface OfflineQueueOptions {
  /** localStorage key, e.g. 'tacklog.station.queue'. */
  storageKey: string;
  /** Sends one action with its key; resolves with the answer or throws (ApiError). */
  send: (action: QueuedAction) => Promise<unknown>;
  /** Told once per action when the server has answered it (accepted or refused). */
  onResult?: (action: QueuedAction, outcome: QueueOutcome) => void;
  storage?: QueueStorage | null;
  newKey?: () => string;
  now?: () => Date;
  /** Whether the browser believes it is online at the start (navigator.onLine). */
  initiallyOnline?: boolean;
}

/** No answer from the server (network down, or a gateway that cannot reach it): keep and retry. */
export function isTransient(err: unknown): boolean {
  return err instanceof ApiError && (err.status === 0 || err.status === 502 || err.status === 503 || err.status === 504);
}

function defaultStorage(): QueueStorage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    // Storage can be disabled by the browser's privacy settings: the queue then lives in memory only.
    return null;
  }
}

function readStored(storage: QueueStorage | null, key: string): QueuedAction[] {
  const text = storage?.getItem(key);
  if (!text) return [];
  try {
    const parsed: unknown = JSON.parse(text);
    if (!Array.isArray(parsed)) return [];
    return parsed.filter(
      (a): a is QueuedAction =>
        typeof a === 'object' && a !== null && typeof (a as QueuedAction).key === 'string' && typeof (a as QueuedAction).kind === 'string',
    );
  } catch (err) {
    console.error('[offline queue] stored queue is unreadable; starting empty', err);
    return [];
  }
}

/** The queue itself, without browser events (testable anywhere). */
export function createOfflineQueue(options: OfflineQueueOptions) {
  const storage = options.storage === undefined ? defaultStorage() : options.storage;
  const newKey = options.newKey ?? (() => crypto.randomUUID());
  const now = options.now ?? (() => new Date());

  const items: Ref<QueuedAction[]> = ref(readStored(storage, options.storageKey));
  const online = ref(options.initiallyOnline ?? true);
  const sending = ref(false);
  /** Set when the server said 401: wait for an explicit flush (after signing in again). */
  const pausedForSignIn = ref(false);
  let running: Promise<void> | null = null;

  function persist() {
    if (!storage) return;
    if (items.value.length === 0) storage.removeItem(options.storageKey);
    else storage.setItem(options.storageKey, JSON.stringify(items.value));
  }

  function enqueue<P>(kind: string, payload: P, label: string): QueuedAction<P> {
    const action: QueuedAction<P> = { key: newKey(), kind, payload, label, queuedAt: now().toISOString(), attempts: 0 };
    items.value = [...items.value, action as QueuedAction];
    persist();
    return action;
  }

  async function drain(): Promise<void> {
    while (items.value.length > 0) {
      const head = items.value[0];
      head.attempts += 1;
      persist();
      let outcome: QueueOutcome;
      try {
        outcome = { ok: true, value: await options.send(head) };
      } catch (err) {
        if (isTransient(err)) {
          online.value = false;
          return;
        }
        if (err instanceof ApiError && err.status === 401) {
          pausedForSignIn.value = true;
          return;
        }
        outcome = {
          ok: false,
          error: err instanceof ApiError ? err : new ApiError(0, 'CLIENT_ERROR', errorText(err)),
        };
      }
      online.value = true;
      items.value = items.value.filter((a) => a.key !== head.key);
      persist();
      options.onResult?.(head, outcome);
    }
  }

  /** Sends what is queued, in order; stops at the first action the server could not be reached for. */
  function flush(): Promise<void> {
    pausedForSignIn.value = false;
    if (!running) {
      sending.value = true;
      running = drain().finally(() => {
        running = null;
        sending.value = false;
      });
    }
    return running;
  }

  /** Queues an action and, unless known offline, sends the queue at once. */
  function submit<P>(kind: string, payload: P, label: string): QueuedAction<P> {
    const action = enqueue(kind, payload, label);
    if (online.value && !pausedForSignIn.value) void flush();
    return action;
  }

  function setOnline(value: boolean) {
    online.value = value;
  }

  /** Drops a queued action that has not been sent (the person changed their mind). */
  function discard(key: string) {
    if (running && items.value[0]?.key === key) return;
    items.value = items.value.filter((a) => a.key !== key);
    persist();
  }

  return {
    items: readonly(items),
    online: readonly(online),
    sending: readonly(sending),
    pausedForSignIn: readonly(pausedForSignIn),
    enqueue,
    submit,
    flush,
    setOnline,
    discard,
  };
}

export type OfflineQueue = ReturnType<typeof createOfflineQueue>;

export const QUEUE_RETRY_MS = 15_000;

/**
 * The queue wired to the browser: sends when the `online` event fires, and retries on a timer
 * while anything is waiting (the `online` event alone is not reliable on every tablet).
 */
export function useOfflineQueue(options: OfflineQueueOptions & { retryMs?: number }): OfflineQueue {
  const hasWindow = typeof window !== 'undefined';
  const queue = createOfflineQueue({
    ...options,
    initiallyOnline: options.initiallyOnline ?? (typeof navigator === 'undefined' ? true : navigator.onLine),
  });
  if (!hasWindow) return queue;

  const onOnline = () => {
    queue.setOnline(true);
    void queue.flush();
  };
  const onOffline = () => queue.setOnline(false);
  window.addEventListener('online', onOnline);
  window.addEventListener('offline', onOffline);
  const timer = window.setInterval(() => {
    if (queue.items.value.length > 0 && !queue.sending.value && !queue.pausedForSignIn.value) void queue.flush();
  }, options.retryMs ?? QUEUE_RETRY_MS);

  if (getCurrentScope()) {
    onScopeDispose(() => {
      window.removeEventListener('online', onOnline);
      window.removeEventListener('offline', onOffline);
      window.clearInterval(timer);
    });
  }
  if (queue.items.value.length > 0) void queue.flush();
  return queue;
}
