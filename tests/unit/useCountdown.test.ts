import { describe, expect, it, vi, afterEach } from 'vitest';
import { effectScope, nextTick } from 'vue';
import { DateTime } from 'luxon';
import { DAY_MS, HOUR_MS, describeCountdown, expiryText, formatSpan, useCountdown } from '../../src/composables/useCountdown';

const NOW = Date.parse('2026-03-04T12:00:00Z');

/** Whole units between two instants according to luxon (the reference library), rounded down. */
function luxonWhole(fromIso: string, toIso: string, unit: 'days' | 'hours' | 'minutes'): number {
  return Math.floor(Math.abs(DateTime.fromISO(toIso).diff(DateTime.fromISO(fromIso), unit).as(unit)));
}

describe('describeCountdown', () => {
  it('counts whole days, rounded down, as luxon does', () => {
    const at = '2026-03-07T20:30:00Z';
    const days = luxonWhole('2026-03-04T12:00:00Z', at, 'days');
    expect(days).toBe(3); // 3 d 8 h 30 min, checked by luxon's Duration
    const hours = luxonWhole('2026-03-04T12:00:00Z', at, 'hours') % 24;
    const c = describeCountdown(at, NOW);
    expect(c.amount).toBe(`${days} d ${hours} h`);
    expect(c.tone).toBe('soon'); // within the default 7 days
    expect(expiryText(c)).toBe('expires in 3 d 8 h');
  });

  it('says hours below two days and minutes below an hour', () => {
    const in30h = new Date(NOW + 30 * HOUR_MS + 59 * 60_000).toISOString();
    expect(describeCountdown(in30h, NOW).amount).toBe(`${luxonWhole(new Date(NOW).toISOString(), in30h, 'hours')} h 59 min`);
    expect(describeCountdown(in30h, NOW).amount).toBe('30 h 59 min');
    const in45min = new Date(NOW + 45 * 60_000 + 30_000).toISOString();
    expect(expiryText(describeCountdown(in45min, NOW))).toBe('expires in 45 min');
    expect(formatSpan(20_000)).toBe('under a minute');
  });

  it('tells an expired instant from one expiring soon and one far off', () => {
    const past = new Date(NOW - 2 * HOUR_MS - 40 * 60_000).toISOString();
    const c = describeCountdown(past, NOW);
    expect(c.past).toBe(true);
    expect(c.tone).toBe('expired');
    // 2 h 40 min ago (luxon: 2 whole hours, 160 whole minutes).
    expect(luxonWhole(past, new Date(NOW).toISOString(), 'hours')).toBe(2);
    expect(luxonWhole(past, new Date(NOW).toISOString(), 'minutes')).toBe(160);
    expect(expiryText(c)).toBe('expired 2 h 40 min ago');

    expect(describeCountdown(new Date(NOW + 3 * DAY_MS).toISOString(), NOW, 7 * DAY_MS).tone).toBe('soon');
    expect(describeCountdown(new Date(NOW + 8 * DAY_MS).toISOString(), NOW, 7 * DAY_MS).tone).toBe('ok');
    expect(describeCountdown(new Date(NOW).toISOString(), NOW).tone).toBe('expired');
    expect(expiryText(describeCountdown(new Date(NOW - 10_000).toISOString(), NOW))).toBe('expired just now');
  });

  it('shows "no expiry" when no limit applies, and ignores unreadable instants', () => {
    expect(describeCountdown(null, NOW).tone).toBe('none');
    expect(expiryText(describeCountdown(null, NOW))).toBe('no expiry');
    expect(describeCountdown('not a date', NOW).msLeft).toBeNull();
  });

  it('reads instants with an offset the same as UTC (ISO 8601)', () => {
    const a = describeCountdown('2026-03-05T13:00:00+01:00', NOW);
    const b = describeCountdown('2026-03-05T12:00:00Z', NOW);
    expect(a.msLeft).toBe(b.msLeft);
    expect(a.msLeft).toBe(DAY_MS);
  });
});

describe('useCountdown', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it('ticks with the clock and stops with its scope', async () => {
    vi.useFakeTimers();
    vi.setSystemTime(NOW);
    const scope = effectScope();
    const target = new Date(NOW + 2 * 60_000 + 5_000).toISOString();
    const result = scope.run(() => useCountdown(target));
    if (!result) throw new Error('no result');
    expect(result.text.value).toBe('expires in 2 min');
    vi.advanceTimersByTime(75_000);
    await nextTick();
    expect(result.text.value).toBe('expires in under a minute');
    vi.advanceTimersByTime(60_000);
    await nextTick();
    expect(result.countdown.value.tone).toBe('expired');
    scope.stop();
    expect(vi.getTimerCount()).toBe(0);
  });
});
