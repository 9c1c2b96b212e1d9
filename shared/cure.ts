/**
 * Temperature-adjusted cure and pot-life times (product brief, "What Tacklog computes", point 2).
 *
 * Times are given at a reference temperature. The reaction runs `rateFactor` times faster at
 * another temperature, by either
 *  - the rule of thumb that the rate multiplies by `factorPer10C` (default 2) per +10 °C
 *    (van 't Hoff's Q10 rule; adhesive makers' technical guidance), or
 *  - Arrhenius, k = A·e^(−Ea/RT), when an activation energy is given.
 * When the temperature varies, the time is done when Σ dt / timeNeededAt(T) reaches 1. Readings are
 * piecewise constant: each holds until the next; before the first reading the first one holds.
 * Pure functions; instants in and out are ISO 8601 strings (out in UTC).
 */
import { nonNegative, ms } from './time';

/** Molar gas constant, J/(mol·K), CODATA 2018 (exact in the 2019 SI). */
export const GAS_CONSTANT = 8.314462618;
const ZERO_KELVIN_C = -273.15;
const MS_PER_MIN = 60_000;

export interface CureProfile {
  refTempC: number;
  handlingMinutes: number;
  fullCureMinutes: number;
  /** rate multiplier per +10 °C; default 2 */
  factorPer10C?: number;
  /** when given, Arrhenius is used instead of the per-10 °C factor */
  activationEnergyKJ?: number;
}

export type RateProfile = Pick<CureProfile, 'refTempC' | 'factorPer10C' | 'activationEnergyKJ'>;

export interface Reading {
  at: string;
  tempC: number;
}

function checkTemp(tempC: number, what: string): number {
  if (typeof tempC !== 'number' || !Number.isFinite(tempC)) throw new RangeError(`${what} must be a finite temperature in °C`);
  if (tempC <= ZERO_KELVIN_C) throw new RangeError(`${what} ${tempC} °C is at or below absolute zero (−273.15 °C)`);
  return tempC;
}

/** How many times faster the reaction runs at tempC than at the profile's reference temperature. */
export function rateFactor(profile: RateProfile, tempC: number): number {
  const ref = checkTemp(profile.refTempC, 'reference temperature');
  const t = checkTemp(tempC, 'temperature');
  const ea = profile.activationEnergyKJ;
  if (ea !== undefined && ea !== null) {
    nonNegative(ea, 'activation energy (kJ/mol)');
    const refK = ref - ZERO_KELVIN_C;
    const k = t - ZERO_KELVIN_C;
    return Math.exp(((ea * 1000) / GAS_CONSTANT) * (1 / refK - 1 / k));
  }
  const factor = profile.factorPer10C ?? 2;
  if (typeof factor !== 'number' || !Number.isFinite(factor) || factor <= 0) {
    throw new RangeError(`rate factor per 10 °C must be a number above 0, got ${String(factor)}`);
  }
  return factor ** ((t - ref) / 10);
}

/** Minutes needed at tempC for something that takes refMinutes at the reference temperature. */
export function adjustedMinutes(refMinutes: number, profile: RateProfile, tempC: number): number {
  return nonNegative(refMinutes, 'minutes') / rateFactor(profile, tempC);
}

interface Segment {
  from: number;
  to: number;
  tempC: number;
}

/** Piecewise-constant temperature segments from `start` on; the last one runs to +∞. */
function segments(startMs: number, readingsOrTemp: Reading[] | number): Segment[] {
  if (typeof readingsOrTemp === 'number') {
    return [{ from: startMs, to: Number.POSITIVE_INFINITY, tempC: checkTemp(readingsOrTemp, 'temperature') }];
  }
  if (!Array.isArray(readingsOrTemp) || readingsOrTemp.length === 0) {
    throw new RangeError('at least one temperature reading is needed');
  }
  const sorted = readingsOrTemp
    .map((r, i) => ({ t: ms(r.at, `reading ${i + 1} time`), tempC: checkTemp(r.tempC, `reading ${i + 1} temperature`) }))
    .sort((a, b) => a.t - b.t);
  // Temperature in force at start: the last reading at or before it, else the first reading.
  let current = sorted[0].tempC;
  for (const r of sorted) if (r.t <= startMs) current = r.tempC;
  const out: Segment[] = [];
  let from = startMs;
  for (const r of sorted) {
    if (r.t <= startMs) continue;
    if (r.t > from) out.push({ from, to: r.t, tempC: current });
    from = r.t;
    current = r.tempC;
  }
  out.push({ from, to: Number.POSITIVE_INFINITY, tempC: current });
  return out;
}

function toIsoMs(t: number): string {
  return new Date(Math.round(t)).toISOString();
}

/**
 * When something that takes refMinutes at the reference temperature is done, starting at `start`,
 * under a constant temperature or piecewise-constant readings. The crossing is solved exactly
 * within its segment.
 */
export function completionTime(start: string, refMinutes: number, profile: RateProfile, readings: Reading[] | number): string {
  const startMs = ms(start, 'start');
  const refMs = nonNegative(refMinutes, 'minutes') * MS_PER_MIN;
  const segs = segments(startMs, readings);
  if (refMs === 0) return toIsoMs(startMs);
  let done = 0;
  for (const seg of segs) {
    const need = refMs / rateFactor(profile, seg.tempC); // ms needed at this temperature
    const gain = (seg.to - seg.from) / need;
    if (done + gain >= 1) return toIsoMs(seg.from + (1 - done) * need);
    done += gain;
  }
  throw new RangeError('completion time could not be reached'); // unreachable: the last segment is open-ended
}

/** Fraction (0..1) of refMinutes done between start and now. */
export function fractionDone(start: string, refMinutes: number, profile: RateProfile, readings: Reading[] | number, now: string): number {
  const startMs = ms(start, 'start');
  const nowMs = ms(now, 'now');
  const refMs = nonNegative(refMinutes, 'minutes') * MS_PER_MIN;
  const segs = segments(startMs, readings);
  if (nowMs <= startMs) return refMs === 0 ? 1 : 0;
  if (refMs === 0) return 1;
  let done = 0;
  for (const seg of segs) {
    if (seg.from >= nowMs) break;
    const until = Math.min(seg.to, nowMs);
    done += (until - seg.from) / (refMs / rateFactor(profile, seg.tempC));
    if (done >= 1) return 1;
  }
  return Math.min(1, done);
}

/** When the bond may be handled and when it is fully cured. */
export function cureTimes(
  profile: CureProfile,
  start: string,
  readingsOrTemp: Reading[] | number,
): { handlingAt: string; fullCureAt: string } {
  return {
    handlingAt: completionTime(start, profile.handlingMinutes, profile, readingsOrTemp),
    fullCureAt: completionTime(start, profile.fullCureMinutes, profile, readingsOrTemp),
  };
}

/** Fraction 0..1 of full cure reached at `now`. */
export function cureProgress(profile: CureProfile, start: string, readingsOrTemp: Reading[] | number, now: string): number {
  return fractionDone(start, profile.fullCureMinutes, profile, readingsOrTemp, now);
}

/** When a mix's pot life (given at the reference temperature) runs out. */
export function potLifeEndsAt(potLifeMinutes: number, profile: RateProfile, mixedAt: string, readingsOrTemp: Reading[] | number): string {
  return completionTime(mixedAt, potLifeMinutes, profile, readingsOrTemp);
}
