import { getCurrentScope, onScopeDispose, readonly, ref, type Ref } from 'vue';

/**
 * The one clock of the client: a single shared `now` (epoch milliseconds) that every countdown,
 * relative time and "today" reads, ticking every TICK_MS while at least one component (or
 * effect scope) listens, and stopped when the last one goes. Call `refresh()` to move it on at
 * once (after loading data, so "3 min ago" starts from the answer).
 *
 * It follows the server's clock once an answer has told the server's time (`alignWithServer`),
 * so a countdown on a device whose clock is off still matches what the server enforces.
 */
export const TICK_MS = 10_000;

let offsetMs = 0;
const now = ref(Date.now());
let listeners = 0;
let timer: ReturnType<typeof setInterval> | undefined;

function tick(): void {
  now.value = Date.now() + offsetMs;
}

/** The server said it is `serverNow` (ISO instant): keep the clock on the server's time. Returns the offset. */
export function alignWithServer(serverNow: string): number {
  const at = Date.parse(serverNow);
  if (Number.isNaN(at)) return offsetMs;
  offsetMs = at - Date.now();
  tick();
  return offsetMs;
}

function listen(): () => void {
  listeners += 1;
  if (listeners === 1) {
    tick();
    timer = setInterval(tick, TICK_MS);
  }
  let stopped = false;
  return () => {
    if (stopped) return;
    stopped = true;
    listeners -= 1;
    if (listeners === 0 && timer !== undefined) {
      clearInterval(timer);
      timer = undefined;
    }
  };
}

export interface UseNow {
  now: Readonly<Ref<number>>;
  refresh: () => void;
  stop: () => void;
}

export function useNow(): UseNow {
  const stop = listen();
  if (getCurrentScope()) onScopeDispose(stop);
  return { now: readonly(now), refresh: tick, stop };
}

/** How many listeners the clock has (for tests). */
export function nowListeners(): number {
  return listeners;
}
