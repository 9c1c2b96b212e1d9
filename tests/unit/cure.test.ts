import { describe, expect, it } from 'vitest';
import {
  GAS_CONSTANT,
  adjustedMinutes,
  completionTime,
  cureProgress,
  cureTimes,
  potLifeEndsAt,
  rateFactor,
  type CureProfile,
} from '../../shared/cure';

const H = 3_600_000;
const T0 = '2025-06-10T08:00:00.000Z';
const plus = (hours: number) => new Date(Date.parse(T0) + hours * H).toISOString();
const hoursFromT0 = (iso: string) => (Date.parse(iso) - Date.parse(T0)) / H;

const epoxy: CureProfile = { refTempC: 25, handlingMinutes: 4 * 60, fullCureMinutes: 24 * 60 };

describe('rate factor', () => {
  it('doubles per 10 °C by default', () => {
    // adhesive makers' technical guidance; common practice (van 't Hoff Q10 = 2):
    // a 24 h cure at 25 °C takes 12 h at 35 °C and 48 h at 15 °C
    expect(adjustedMinutes(24 * 60, epoxy, 35)).toBeCloseTo(12 * 60, 9);
    expect(adjustedMinutes(24 * 60, epoxy, 15)).toBeCloseTo(48 * 60, 9);
    expect(adjustedMinutes(24 * 60, epoxy, 25)).toBe(24 * 60);
    // Q10 definition: R2/R1 = Q10^((T2 − T1)/10); 5 °C warmer with Q10 = 2 → √2
    expect(rateFactor(epoxy, 30)).toBeCloseTo(Math.SQRT2, 12);
    expect(rateFactor({ refTempC: 25, factorPer10C: 3 }, 45)).toBeCloseTo(9, 12);
  });

  it('follows Arrhenius when an activation energy is given', () => {
    // references.md (computed): Ea ≈ 51.2 kJ/mol doubles the rate between 20 °C and 30 °C.
    // Expected value worked independently from Arrhenius k = A·e^(−Ea/RT), R = 8.314462618 J/(mol·K) (CODATA 2018).
    const expected = Math.exp((51_200 / 8.314462618) * (1 / 293.15 - 1 / 303.15));
    expect(rateFactor({ refTempC: 20, activationEnergyKJ: 51.2 }, 30)).toBeCloseTo(expected, 12);
    expect(expected).toBeCloseTo(2.0, 2);
    // the Ea that gives exactly 2.0 over 20→30 °C, solved from the same equation
    const ea = (GAS_CONSTANT * Math.log(2)) / (1 / 293.15 - 1 / 303.15) / 1000;
    expect(ea).toBeCloseTo(51.2, 1);
    expect(rateFactor({ refTempC: 20, activationEnergyKJ: ea }, 30)).toBeCloseTo(2, 12);
    // colder is slower, and Ea = 0 means no temperature dependence
    expect(rateFactor({ refTempC: 20, activationEnergyKJ: 51.2 }, 10)).toBeLessThan(1);
    expect(rateFactor({ refTempC: 20, activationEnergyKJ: 0 }, 60)).toBe(1);
  });

  it('refuses impossible inputs', () => {
    expect(() => rateFactor(epoxy, Number.NaN)).toThrow(RangeError);
    expect(() => rateFactor(epoxy, Number.POSITIVE_INFINITY)).toThrow(RangeError);
    expect(() => rateFactor(epoxy, -300)).toThrow(/absolute zero/);
    expect(() => rateFactor({ refTempC: 25, factorPer10C: 0 }, 30)).toThrow(/factor/);
    expect(() => rateFactor({ refTempC: 25, factorPer10C: -2 }, 30)).toThrow(/factor/);
    expect(() => rateFactor({ refTempC: 25, activationEnergyKJ: -5 }, 30)).toThrow(/activation/);
    expect(() => adjustedMinutes(-1, epoxy, 25)).toThrow(/minutes/);
    expect(() => completionTime(T0, 60, epoxy, [])).toThrow(/reading/);
    expect(() => completionTime('not a time', 60, epoxy, 25)).toThrow(RangeError);
  });
});

describe('completion time with varying temperature', () => {
  it('a constant temperature gives the single-temperature result', () => {
    const single = completionTime(T0, 24 * 60, epoxy, 30);
    expect(completionTime(T0, 24 * 60, epoxy, [{ at: T0, tempC: 30 }])).toBe(single);
    expect(hoursFromT0(single)).toBeCloseTo(24 / Math.SQRT2, 6);
  });

  it('integrates across a temperature step', () => {
    // brief point 2 (Σ dt / t_needed(T) = 1) with the doubling rule:
    // 6 h at 25 °C = 25 %; the remaining 75 % at 35 °C needs 0.75 × 12 h = 9 h → done after 15 h
    const readings = [
      { at: T0, tempC: 25 },
      { at: plus(6), tempC: 35 },
    ];
    expect(completionTime(T0, 24 * 60, epoxy, readings)).toBe(plus(15));
    // three steps: 6 h @25 (1/4), 8 h @15 (8/48 = 1/6), rest 7/12 @35 needs 7/12 × 12 h = 7 h → 21 h
    const three = [
      { at: plus(6), tempC: 15 },
      { at: T0, tempC: 25 },
      { at: plus(14), tempC: 35 },
    ]; // unsorted on purpose
    expect(completionTime(T0, 24 * 60, epoxy, three)).toBe(plus(21));
  });

  it('uses the last reading before the start, and the first reading when none precede it', () => {
    const before = [
      { at: plus(-5), tempC: 15 },
      { at: plus(-2), tempC: 35 },
    ];
    expect(completionTime(T0, 24 * 60, epoxy, before)).toBe(plus(12));
    const onlyLater = [{ at: plus(3), tempC: 15 }];
    expect(completionTime(T0, 24 * 60, epoxy, onlyLater)).toBe(plus(48));
  });

  it('reaches completion inside a segment, not at its end', () => {
    const readings = [
      { at: T0, tempC: 35 },
      { at: plus(100), tempC: 15 },
    ];
    expect(completionTime(T0, 24 * 60, epoxy, readings)).toBe(plus(12));
  });

  it('gives handling and full-cure times and the progress between', () => {
    const readings = [
      { at: T0, tempC: 25 },
      { at: plus(6), tempC: 35 },
    ];
    const t = cureTimes(epoxy, T0, readings);
    expect(t.handlingAt).toBe(plus(4)); // 4 h handling at the reference temperature
    expect(t.fullCureAt).toBe(plus(15));
    expect(cureProgress(epoxy, T0, readings, plus(-1))).toBe(0);
    expect(cureProgress(epoxy, T0, readings, plus(6))).toBeCloseTo(0.25, 12);
    expect(cureProgress(epoxy, T0, readings, plus(10.5))).toBeCloseTo(0.25 + 4.5 / 12, 12);
    expect(cureProgress(epoxy, T0, readings, plus(15))).toBe(1);
    expect(cureProgress(epoxy, T0, readings, plus(99))).toBe(1);
  });

  it('pot life shortens when warm and lengthens when cool', () => {
    // common practice: pot life follows the same rate rule; 40 min at 25 °C → 20 min at 35 °C
    expect(potLifeEndsAt(40, epoxy, T0, 35)).toBe('2025-06-10T08:20:00.000Z');
    expect(potLifeEndsAt(40, epoxy, T0, 15)).toBe('2025-06-10T09:20:00.000Z');
    expect(potLifeEndsAt(0, epoxy, T0, 15)).toBe(T0);
  });
});
