import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import { formatDuration } from '@shared/plant-time';
import { useNow } from './useNow';

/**
 * Time left to an instant (an expiry, a cure completion), as text people read at a glance:
 * "expires in 3 d 8 h", "expires in 5 h 20 min", "expired 2 h 40 min ago" (durations from the
 * shared formatDuration, the one duration format). The amount is rounded down, so the
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
  /** "3 d 8 h", "5 h 20 min", "12 min", "under a minute"; '' when there is no instant. */
  amount: string;
  past: boolean;
  tone: CountdownTone;
}

/** A span rounded down with the shared duration format; under a minute it says so (screens tick every 10 s). */
export function formatSpan(ms: number): string {
  return Math.abs(ms) >= MINUTE_MS ? formatDuration(ms) : 'under a minute';
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

/**
 * A live countdown to `at` (ISO instant, or null for "no limit"), on the one client clock
 * (useNow), while the component (or effect scope) that called it is alive.
 */
export function useCountdown(at: MaybeRefOrGetter<string | null | undefined>, soonMs: MaybeRefOrGetter<number> = 7 * DAY_MS) {
  const { now, stop } = useNow();
  const countdown = computed(() => describeCountdown(toValue(at), now.value, toValue(soonMs)));
  const text = computed(() => expiryText(countdown.value));
  return { countdown, text, now: computed(() => now.value), stop };
}
