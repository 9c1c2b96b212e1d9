import { describe, expect, it } from 'vitest';
import {
  humidityWindowCheck,
  methodCureTimes,
  minutesNeededAt,
  scheduleMinutesAt,
  uvDose,
  uvExposureSeconds,
} from '../../shared/cure-methods';

const at = (h: number, m = 0) => new Date(Date.UTC(2026, 11, 2, h, m)).toISOString();

describe('heat-cure schedule', () => {
  const schedule = [
    { tempC: 120, minutes: 30 },
    { tempC: 150, minutes: 15 },
  ];

  it('interpolates log-linearly between points: 21.2 min at 135 °C (√(30 × 15), computed)', () => {
    expect(scheduleMinutesAt(schedule, 135)).toBeCloseTo(Math.sqrt(30 * 15), 10);
    expect(scheduleMinutesAt(schedule, 135)).toBeCloseTo(21.21, 2);
  });

  it('gives the data-sheet time at a schedule point', () => {
    expect(scheduleMinutesAt(schedule, 120)).toBeCloseTo(30, 10);
    expect(scheduleMinutesAt(schedule, 150)).toBeCloseTo(15, 10);
  });

  it('extends the nearest point by the rate rule outside the schedule (×2 per 10 °C: common practice)', () => {
    expect(scheduleMinutesAt(schedule, 160)).toBeCloseTo(7.5, 10);
    expect(scheduleMinutesAt(schedule, 110)).toBeCloseTo(60, 10);
    expect(scheduleMinutesAt(schedule, 100, { factorPer10C: 3 })).toBeCloseTo(270, 10);
  });

  it('refuses an empty schedule or a point without time', () => {
    expect(() => scheduleMinutesAt([], 120)).toThrow(/schedule point/);
    expect(() => scheduleMinutesAt([{ tempC: 120, minutes: 0 }], 120)).toThrow(/minutes/);
  });

  it('times an oven cure from the oven readings, handling in the data-sheet ratio', () => {
    const profile = { method: 'heat' as const, refTempC: 120, handlingMinutes: 15, fullCureMinutes: 30, schedule };
    // Oven at 120 °C from 10:00: full cure at 10:30, handling at 10:15.
    const r = methodCureTimes(profile, at(10), [{ at: at(10), tempC: 120 }]);
    expect(r).toMatchObject({ fullCureAt: at(10, 30), handlingAt: at(10, 15) });
    // 10 min at 120 °C (1/3 done), then 150 °C: the remaining 2/3 of 15 min = 10 min → 10:20.
    const r2 = methodCureTimes(profile, at(10), [
      { at: at(10), tempC: 120 },
      { at: at(10, 10), tempC: 150 },
    ]);
    expect(r2.fullCureAt).toBe(at(10, 20));
  });
});

describe('ambient cure with a minimum cure temperature', () => {
  // 60 min at 20 °C, ×2 per 10 °C; no progress below 10 °C (data sheets: "do not cure below 10 °C").
  const profile = { refTempC: 20, handlingMinutes: 30, fullCureMinutes: 60, minTempC: 10 };

  it('makes no progress while the first part of the cure sits below the minimum', () => {
    // 08:00–10:00 at 5 °C (nothing), then 20 °C: full cure one hour later at 11:00.
    const r = methodCureTimes(profile, at(8), [
      { at: at(8), tempC: 5 },
      { at: at(10), tempC: 20 },
    ]);
    expect(r.fullCureAt).toBe(at(11));
    expect(r.handlingAt).toBe(at(10, 30));
    expect(r.minutesBelowMin).toBeCloseTo(120, 6);
  });

  it('never completes while the temperature stays below the minimum', () => {
    const r = methodCureTimes(profile, at(8), [{ at: at(8), tempC: 5 }], at(12));
    expect(r.fullCureAt).toBeNull();
    expect(r.minutesBelowMin).toBeCloseTo(240, 6);
  });

  it('is the plain rate rule above the minimum', () => {
    expect(minutesNeededAt(profile, 30)).toBeCloseTo(30, 10);
    expect(minutesNeededAt(profile, 9.9)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('UV dose', () => {
  it('is irradiance × time: 100 mW/cm² × 30 s = 3,000 mJ/cm² (1 mW·s = 1 mJ, SI)', () => {
    expect(uvDose(100, 30)).toBe(3000);
    expect(uvExposureSeconds(3000, 100)).toBe(30);
    expect(uvExposureSeconds(3000, 75)).toBe(40);
  });

  it('refuses a lamp with no irradiance', () => {
    expect(() => uvExposureSeconds(3000, 0)).toThrow(/irradiance/);
    expect(() => uvDose(-1, 30)).toThrow(/irradiance/);
  });
});

describe("humidity window (cyanoacrylates cure slowly below about 30 % RH: adhesive makers' guidance)", () => {
  const window = { rhMinPct: 40, rhMaxPct: 70 };

  it('passes a cure that stayed inside the window', () => {
    expect(
      humidityWindowCheck(window, at(8), at(12), [
        { at: at(7), rhPct: 55 },
        { at: at(10), rhPct: 45 },
      ]).ok,
    ).toBe(true);
  });

  it('flags a cure that crossed out of the window, with the stretch outside', () => {
    const r = humidityWindowCheck(window, at(8), at(12), [
      { at: at(7), rhPct: 55 },
      { at: at(9), rhPct: 25 },
      { at: at(10), rhPct: 50 },
    ]);
    expect(r.ok).toBe(false);
    expect(r.outside).toEqual([{ from: at(9), to: at(10), rhPct: 25 }]);
  });

  it('ignores readings after the cure ended', () => {
    expect(
      humidityWindowCheck(window, at(8), at(9), [
        { at: at(7), rhPct: 55 },
        { at: at(10), rhPct: 20 },
      ]).ok,
    ).toBe(true);
  });
});
