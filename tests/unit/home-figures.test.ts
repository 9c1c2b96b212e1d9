import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { HomeFigures } from '@shared/schemas/home';
import { ApiError } from '@/api/http';
import { HOME_REFRESH_MS, createHomeFigures, type ReturnSignals } from '@/composables/useHomeFigures';

/** A minimal answer, told apart by its `now`. */
const answer = (now: string): HomeFigures => ({ now, zone: 'UTC', day: { date: now.slice(0, 10), start: now, end: now } });

/** A window and document that the test fires events on. */
function fakeSignals(): ReturnSignals & { fire(target: 'window' | 'document', type: string): void; listeners(): number } {
  const handlers = { window: new Map<string, Set<() => void>>(), document: new Map<string, Set<() => void>>() };
  const target = (which: 'window' | 'document') => ({
    addEventListener: (type: string, fn: () => void) =>
      void (handlers[which].get(type) ?? handlers[which].set(type, new Set()).get(type)!).add(fn),
    removeEventListener: (type: string, fn: () => void) => void handlers[which].get(type)?.delete(fn),
  });
  const doc = { ...target('document'), visibilityState: 'visible' as DocumentVisibilityState };
  return {
    window: target('window') as unknown as ReturnSignals['window'],
    document: doc as unknown as ReturnSignals['document'],
    fire: (which, type) => handlers[which].get(type)?.forEach((fn) => fn()),
    listeners: () => [...handlers.window.values(), ...handlers.document.values()].reduce((n, s) => n + s.size, 0),
  };
}

const settle = () => vi.advanceTimersByTimeAsync(0);

describe('home figures: read on start, every minute, and when the person comes back', () => {
  beforeEach(() => {
    vi.useFakeTimers();
    vi.setSystemTime(new Date('2026-12-02T08:00:00Z'));
  });
  afterEach(() => vi.useRealTimers());

  it('reads at start and again every minute; focus or visibility reads at once, but not twice within two seconds', async () => {
    let n = 0;
    const fetcher = vi.fn(async () => answer(`2026-12-02T08:00:0${n++}.000Z`));
    const signals = fakeSignals();
    const home = createHomeFigures(fetcher, signals);
    home.start();
    await settle();
    expect(fetcher).toHaveBeenCalledTimes(1);
    expect(home.figures.value?.now).toBe('2026-12-02T08:00:00.000Z');

    await vi.advanceTimersByTimeAsync(HOME_REFRESH_MS);
    expect(fetcher).toHaveBeenCalledTimes(2);

    await vi.advanceTimersByTimeAsync(5_000);
    signals.fire('window', 'focus');
    signals.fire('document', 'visibilitychange'); // the same return: no second read
    await settle();
    expect(fetcher).toHaveBeenCalledTimes(3);

    await vi.advanceTimersByTimeAsync(5_000);
    (signals.document as { visibilityState: string }).visibilityState = 'hidden';
    signals.fire('document', 'visibilitychange'); // going away reads nothing
    await settle();
    expect(fetcher).toHaveBeenCalledTimes(3);

    home.stop();
    expect(signals.listeners()).toBe(0);
    await vi.advanceTimersByTimeAsync(3 * HOME_REFRESH_MS);
    expect(fetcher).toHaveBeenCalledTimes(3);
  });

  it('a late answer to an older request never replaces a newer one', async () => {
    const pending: { resolve: (f: HomeFigures) => void; signal: AbortSignal }[] = [];
    const fetcher = (_q: unknown, signal: AbortSignal) => new Promise<HomeFigures>((resolve) => pending.push({ resolve, signal }));
    const home = createHomeFigures(fetcher);
    void home.load();
    void home.load();
    expect(pending[0].signal.aborted).toBe(true);
    pending[1].resolve(answer('2026-12-02T08:01:00.000Z'));
    await settle();
    pending[0].resolve(answer('2026-12-02T08:00:00.000Z'));
    await settle();
    expect(home.figures.value?.now).toBe('2026-12-02T08:01:00.000Z');
    expect(home.loading.value).toBe(false);
  });

  it('a failed refresh keeps the figures shown and says they may be out of date', async () => {
    let fail = false;
    const fetcher = async () => {
      if (fail) throw new ApiError(503, 'DB_UNAVAILABLE', 'The database is unreachable.');
      return answer('2026-12-02T08:00:00.000Z');
    };
    const home = createHomeFigures(fetcher);
    await home.load();
    fail = true;
    await home.load();
    expect(home.figures.value?.now).toBe('2026-12-02T08:00:00.000Z');
    expect(home.problem.value).toMatch(/could not be read \(those shown may be out of date\)/);
    fail = false;
    await home.load();
    expect(home.problem.value).toBe('');
  });
});
