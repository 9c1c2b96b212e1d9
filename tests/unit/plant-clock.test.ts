import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick } from 'vue';
import { createPinia, setActivePinia } from 'pinia';

vi.mock('@/api/plant', () => ({ getPlantConfig: vi.fn() }));
const plantApi = await import('@/api/plant');
const { usePlantStore } = await import('@/stores/plant');
const { TICK_MS, alignWithServer, nowListeners, useNow } = await import('@/composables/useNow');
const { usePlantTime } = await import('@/composables/usePlantTime');

const NOW = Date.parse('2026-12-02T02:55:00Z'); // 03:55 in Berlin, 21:55 the day before in New York

beforeEach(() => {
  setActivePinia(createPinia());
  vi.stubGlobal('fetch', () => {
    throw new Error('unexpected network request: stores must call src/api only');
  });
  vi.mocked(plantApi.getPlantConfig).mockReset();
});
afterEach(() => {
  vi.useRealTimers();
  vi.unstubAllGlobals();
});

describe('plant store', () => {
  it('asks the server once for the zone, shares the request, and asks again after a failure', async () => {
    vi.mocked(plantApi.getPlantConfig).mockRejectedValueOnce(new Error('offline'));
    vi.mocked(plantApi.getPlantConfig).mockResolvedValue({ plantZone: 'Europe/Berlin', plantName: 'Halvard Bay Driver Works' });
    const plant = usePlantStore();
    expect(plant.zone).toBe('UTC');
    await expect(plant.ensureLoaded()).rejects.toThrow('offline');
    expect(plant.known).toBe(false);
    await Promise.all([plant.ensureLoaded(), plant.ensureLoaded()]);
    await plant.ensureLoaded();
    expect(plantApi.getPlantConfig).toHaveBeenCalledTimes(2);
    expect(plant.zone).toBe('Europe/Berlin');
    expect(plant.name).toBe('Halvard Bay Driver Works');
    expect(plant.known).toBe(true);
  });
});

describe('the one client clock', () => {
  it('one timer for every listener, ticking, and stopped when the last scope goes', async () => {
    vi.useFakeTimers();
    vi.setSystemTime(NOW);
    const a = effectScope();
    const b = effectScope();
    const first = a.run(() => useNow())!;
    const second = b.run(() => useNow())!;
    expect(nowListeners()).toBe(2);
    expect(vi.getTimerCount()).toBe(1);
    vi.advanceTimersByTime(TICK_MS);
    expect(first.now.value).toBe(NOW + TICK_MS);
    expect(second.now.value).toBe(first.now.value);
    a.stop();
    expect(vi.getTimerCount()).toBe(1);
    b.stop();
    expect(vi.getTimerCount()).toBe(0);
    expect(nowListeners()).toBe(0);
  });

  it('follows the server clock once told it', () => {
    vi.useFakeTimers();
    vi.setSystemTime(NOW);
    const scope = effectScope();
    const clock = scope.run(() => useNow())!;
    expect(alignWithServer(new Date(NOW + 90_000).toISOString())).toBe(90_000);
    expect(clock.now.value).toBe(NOW + 90_000);
    alignWithServer(new Date(NOW).toISOString());
    scope.stop();
  });
});

describe('usePlantTime', () => {
  it('formats in the plant zone from the server, not the machine zone, and greets by the plant hour', async () => {
    vi.useFakeTimers();
    vi.setSystemTime(NOW);
    vi.mocked(plantApi.getPlantConfig).mockResolvedValue({ plantZone: 'America/New_York', plantName: 'Plant' });
    const scope = effectScope();
    const t = scope.run(() => usePlantTime())!;
    // Before the zone is known: UTC.
    expect(t.time('2026-12-02T02:30:00Z')).toBe('02:30');
    await usePlantStore().ensureLoaded();
    await nextTick();
    // 02:30Z is 21:30 EST on Tuesday 1 December and now is 21:55 EST that day (IANA tz database).
    expect(t.time('2026-12-02T02:30:00Z')).toBe('21:30');
    expect(t.time('2026-12-02T06:00:00Z')).toBe('Wed 01:00');
    expect(t.dateTime('2026-12-02T02:30:00Z')).toBe('2026-12-01 21:30');
    expect(t.date(null)).toBe('');
    expect(t.greeting()).toBe('Good evening');
    expect(t.relative('2026-12-02T06:15:00Z')).toBe('in 3 h 20 min');
    scope.stop();
  });
});
