import { computed, getCurrentScope, onScopeDispose, ref, toValue, type MaybeRefOrGetter } from 'vue';

/**
 * Time left to an instant (an expiry, a cure completion), as text people read at a glance:
 * "expires in 3 d", "expires in 5 h", "expired 2 h ago". The amount is rounded down, so the
 * screen never promises more time than is left. Status is text plus a tone (colour), never
 * colour alone.
 */

export const MINUTE_MS = 60_000;
export const HOUR_MS = 60 * MINUTE_MS;
export const DAY_MS = 24 * HOUR_MS;

export type CountdownTone = 'none' | 'expired' | 'soon' | 'ok';

export interface Countdown {
  /** Milliseconds until the instant (negative once past); null when there is none. */
  msLeft: number | null;
  /** "3 d", "5 h", "12 min", "under a minute"; '' when there is no instant. */
  amount: string;
  past: boolean;
  tone: CountdownTone;
}

/** A positive span, rounded down: days from 2 d up, hours from 1 h up, then minutes. */
export function formatSpan(ms: number): string {
  const abs = Math.abs(ms);
  if (abs >= 2 * DAY_MS) return `${Math.floor(abs / DAY_MS)} d`;
  if (abs >= HOUR_MS) return `${Math.floor(abs / HOUR_MS)} h`;
  if (abs >= MINUTE_MS) return `${Math.floor(abs / MINUTE_MS)} min`;
  return 'under a minute';
}

/**
 * Where `at` stands seen from `now`: past it (`expired`), within `soonMs` of it (`soon`), or
 * further (`ok`). No instant (`null`: no limit applies) is `none`.
 */
export function describeCountdown(at: string | null | undefined, now: number, soonMs = 7 * DAY_MS): Countdown {
  if (!at) return { msLeft: null, amount: '', past: false, tone: 'none' };
  const target = Date.parse(at);
  if (Number.isNaN(target)) return { msLeft: null, amount: '', past: false, tone: 'none' };
  const msLeft = target - now;
  const past = msLeft <= 0;
  const tone: CountdownTone = past ? 'expired' : msLeft <= soonMs ? 'soon' : 'ok';
  return { msLeft, amount: formatSpan(msLeft), past, tone };
}

/** "expires in 3 d" / "expired 2 h ago" / "expired just now" / "no expiry". */
export function expiryText(c: Countdown, words = { future: 'expires in', past: 'expired', none: 'no expiry' }): string {
  if (c.msLeft === null) return words.none;
  if (c.past) return c.amount === 'under a minute' ? `${words.past} just now` : `${words.past} ${c.amount} ago`;
  return `${words.future} ${c.amount}`;
}

// One clock for every countdown on the page, ticking while anyone listens.
const now = ref(Date.now());
let listeners = 0;
let timer: ReturnType<typeof setInterval> | undefined;
const TICK_MS = 15_000;

function listen(): () => void {
  listeners += 1;
  if (listeners === 1) {
    now.value = Date.now();
    timer = setInterval(() => {
      now.value = Date.now();
    }, TICK_MS);
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

/**
 * A live countdown to `at` (ISO instant, or null for "no limit"). Ticks every 15 s while the
 * component (or effect scope) that called it is alive.
 */
export function useCountdown(at: MaybeRefOrGetter<string | null | undefined>, soonMs: MaybeRefOrGetter<number> = 7 * DAY_MS) {
  const stop = listen();
  if (getCurrentScope()) onScopeDispose(stop);
  const countdown = computed(() => describeCountdown(toValue(at), now.value, toValue(soonMs)));
  const text = computed(() => expiryText(countdown.value));
  return { countdown, text, now: computed(() => now.value), stop };
}

/** The page's one clock (ticks every 15 s while someone listens), for views that only need "now". */
export function useNow() {
  const stop = listen();
  if (getCurrentScope()) onScopeDispose(stop);
  return computed(() => now.value);
}
