/**
 * shared/time.ts `instant`: the fast path for the API's own UTC form must read every instant
 * exactly as luxon's general ISO 8601 parser does (the reference here), and refuse what it refuses.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { checkZone, instant } from '../../shared/time';

const reference = (iso: string) => DateTime.fromISO(iso, { zone: 'utc', setZone: true });

describe('instant', () => {
  it('reads toISOString output exactly as luxon.fromISO does (property over 1970–2100)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 4102444800000 }), (t) => {
        const iso = new Date(t).toISOString();
        const ours = instant(iso);
        const ref = reference(iso);
        expect(ours.toMillis()).toBe(ref.toMillis());
        expect(ours.offset).toBe(ref.offset);
        expect(ours.toISO()).toBe(ref.toISO());
      }),
    );
  });

  it('reads seconds without fraction and one or two fraction digits as luxon does', () => {
    for (const iso of ['2026-03-29T01:30:00Z', '2026-03-29T01:30:00.5Z', '2026-03-29T01:30:00.25Z']) {
      expect(instant(iso).toMillis()).toBe(reference(iso).toMillis());
    }
  });

  it('refuses a calendar date that does not exist and says what it was', () => {
    expect(() => instant('2026-02-30T00:00:00Z', 'openedAt')).toThrow(/openedAt "2026-02-30T00:00:00Z"/);
    expect(() => instant('2026-13-01T00:00:00.000Z')).toThrow(RangeError);
    expect(() => instant('2026-01-01T24:30:00Z')).toThrow(RangeError);
  });

  it('keeps an explicit offset (the general path)', () => {
    expect(instant('2026-10-25T02:30:00+02:00').toUTC().toISO()).toBe('2026-10-25T00:30:00.000Z');
  });
});

describe('checkZone', () => {
  it('accepts a real zone twice and refuses an unknown one every time', () => {
    expect(checkZone('Europe/Berlin')).toBe('Europe/Berlin');
    expect(checkZone('Europe/Berlin')).toBe('Europe/Berlin');
    expect(() => checkZone('Mars/Olympus')).toThrow(/unknown time zone/);
    expect(() => checkZone('Mars/Olympus')).toThrow(/unknown time zone/);
  });
});
