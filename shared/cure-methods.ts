/**
 * Cure by method: how each adhesive really cures, so that "cure-compliant" means what its
 * technical data sheet means.
 *
 *  - ambient: room-temperature cure at the area's air temperature (shared/cure.ts rate rule),
 *    with an optional minimum cure temperature below which no progress is made.
 *  - heat: a one-part heat-cure adhesive in an oven, following the data sheet's schedule of
 *    (temperature, minutes) points; between points ln(time) is linear in temperature; outside
 *    them the rate rule (×factor per 10 °C, or Arrhenius) extends the nearest point.
 *  - uv: a dose in mJ/cm² = irradiance (mW/cm²) × exposure time (s).
 * A humidity window (moisture-curing adhesives) is a compliance check, not a rate: a cure that
 * ran while the humidity was outside it is flagged.
 *
 * Pure functions; instants in and out are ISO 8601 strings (out in UTC).
 */
import { rateFactor, type CureProfile, type Reading } from './cure';
import { ms, nonNegative } from './time';

export const CURE_METHODS = ['ambient', 'heat', 'uv'] as const;
export type CureMethod = (typeof CURE_METHODS)[number];

export interface SchedulePoint {
  tempC: number;
  minutes: number;
}

export interface MethodCureProfile extends CureProfile {
  method?: CureMethod;
  /** ambient: no cure progress below this temperature */
  minTempC?: number | null;
  /** heat: full-cure minutes at oven temperatures */
  schedule?: SchedulePoint[] | null;
  /** uv: required dose */
  uvDoseMJcm2?: number | null;
  rhMinPct?: number | null;
  rhMaxPct?: number | null;
}

const MS_PER_MIN = 60_000;

function checkSchedule(schedule: SchedulePoint[]): SchedulePoint[] {
  if (!Array.isArray(schedule) || schedule.length === 0)
    throw new RangeError('a heat cure needs at least one schedule point (temperature, minutes)');
  const sorted = [...schedule].sort((a, b) => a.tempC - b.tempC);
  for (let i = 0; i < sorted.length; i++) {
    const p = sorted[i];
    if (!Number.isFinite(p.tempC)) throw new RangeError(`schedule point ${i + 1}: temperature must be a number`);
    if (!Number.isFinite(p.minutes) || p.minutes <= 0) throw new RangeError(`schedule point ${i + 1}: minutes must be above 0`);
    if (i > 0 && sorted[i - 1].tempC === p.tempC) throw new RangeError(`schedule has two points at ${p.tempC} °C`);
  }
  return sorted;
}

/**
 * Full-cure minutes at a constant oven temperature from a data-sheet schedule: log-linear
 * interpolation between the points around it (ln t linear in T, so halfway between 30 min at
 * 120 °C and 15 min at 150 °C is √(30 × 15) ≈ 21.2 min); outside the schedule the profile's rate
 * rule extends the nearest point.
 */
export function scheduleMinutesAt(
  schedule: SchedulePoint[],
  tempC: number,
  rate: Pick<CureProfile, 'factorPer10C' | 'activationEnergyKJ'> = {},
): number {
  const pts = checkSchedule(schedule);
  const first = pts[0];
  const last = pts[pts.length - 1];
  if (tempC <= first.tempC) return first.minutes / rateFactor({ ...rate, refTempC: first.tempC }, tempC);
  if (tempC >= last.tempC) return last.minutes / rateFactor({ ...rate, refTempC: last.tempC }, tempC);
  for (let i = 0; i < pts.length - 1; i++) {
    const a = pts[i];
    const b = pts[i + 1];
    if (tempC >= a.tempC && tempC <= b.tempC) {
      const f = (tempC - a.tempC) / (b.tempC - a.tempC);
      return Math.exp(Math.log(a.minutes) + f * (Math.log(b.minutes) - Math.log(a.minutes)));
    }
  }
  throw new RangeError('temperature outside the schedule'); // unreachable
}

/**
 * Minutes needed at a constant temperature for `which` (handling or full cure) by the profile's
 * method; Infinity when no progress is made there (below the minimum cure temperature).
 */
export function minutesNeededAt(profile: MethodCureProfile, tempC: number, which: 'handling' | 'full' = 'full'): number {
  const method = profile.method ?? 'ambient';
  if (method === 'uv') throw new RangeError('a UV cure is counted by dose, not by time at a temperature');
  if (profile.minTempC !== undefined && profile.minTempC !== null && tempC < profile.minTempC) return Number.POSITIVE_INFINITY;
  const refMinutes = which === 'full' ? profile.fullCureMinutes : profile.handlingMinutes;
  nonNegative(refMinutes, 'minutes');
  if (method === 'heat') {
    const full = scheduleMinutesAt(profile.schedule ?? [], tempC, profile);
    // Handling keeps the data sheet's ratio of handling time to full cure.
    return which === 'full' || profile.fullCureMinutes === 0 ? full : (full * profile.handlingMinutes) / profile.fullCureMinutes;
  }
  return refMinutes / rateFactor(profile, tempC);
}

interface Segment {
  from: number;
  to: number;
  value: number;
}

/** Piecewise-constant segments of a reading series from `startMs` on; the last runs to +∞. */
function stepSegments<T extends { at: string }>(startMs: number, readings: T[], value: (r: T) => number): Segment[] {
  if (!Array.isArray(readings) || readings.length === 0) throw new RangeError('at least one reading is needed');
  const sorted = readings.map((r, i) => ({ t: ms(r.at, `reading ${i + 1} time`), v: value(r) })).sort((a, b) => a.t - b.t);
  let current = sorted[0].v;
  for (const r of sorted) if (r.t <= startMs) current = r.v;
  const out: Segment[] = [];
  let from = startMs;
  for (const r of sorted) {
    if (r.t <= startMs) continue;
    if (r.t > from) out.push({ from, to: r.t, value: current });
    from = r.t;
    current = r.v;
  }
  out.push({ from, to: Number.POSITIVE_INFINITY, value: current });
  return out;
}

function temperatureSegments(startMs: number, readingsOrTemp: Reading[] | number): Segment[] {
  if (typeof readingsOrTemp === 'number') return [{ from: startMs, to: Number.POSITIVE_INFINITY, value: readingsOrTemp }];
  return stepSegments(startMs, readingsOrTemp, (r) => r.tempC);
}

export interface MethodCureResult {
  /** null when the cure does not complete at the last temperature known (below the minimum) */
  handlingAt: string | null;
  fullCureAt: string | null;
  /** minutes spent below the minimum cure temperature between start and full cure (or `now`) */
  minutesBelowMin: number;
}

function crossing(segs: Segment[], needMsAt: (tempC: number) => number): number | null {
  let done = 0;
  for (const seg of segs) {
    const need = needMsAt(seg.value);
    if (need === 0) return seg.from;
    if (!Number.isFinite(need)) continue; // no progress in this stretch
    const gain = (seg.to - seg.from) / need;
    if (done + gain >= 1) return seg.from + (1 - done) * need;
    done += gain;
  }
  return null; // the last, open-ended stretch makes no progress
}

/**
 * When a heat or ambient cure reaches handling strength and full cure, from `start`, under a
 * constant temperature or piecewise-constant readings (each holds until the next). Time below
 * the minimum cure temperature adds nothing.
 */
export function methodCureTimes(
  profile: MethodCureProfile,
  start: string,
  readingsOrTemp: Reading[] | number,
  now?: string,
): MethodCureResult {
  const startMs = ms(start, 'start');
  const segs = temperatureSegments(startMs, readingsOrTemp);
  const needMs = (which: 'handling' | 'full') => (t: number) => minutesNeededAt(profile, t, which) * MS_PER_MIN;
  const handling = crossing(segs, needMs('handling'));
  const full = crossing(segs, needMs('full'));
  const until = full ?? (now ? ms(now, 'now') : startMs);
  let below = 0;
  if (profile.minTempC !== undefined && profile.minTempC !== null) {
    for (const s of segs) {
      if (s.from >= until) break;
      if (s.value < profile.minTempC) below += Math.min(s.to, until) - s.from;
    }
  }
  const iso = (t: number | null) => (t === null ? null : new Date(Math.round(t)).toISOString());
  return { handlingAt: iso(handling), fullCureAt: iso(full), minutesBelowMin: below / MS_PER_MIN };
}

/** UV dose in mJ/cm² delivered by an irradiance in mW/cm² over `seconds` (1 mW·s = 1 mJ). */
export function uvDose(irradianceMWcm2: number, seconds: number): number {
  return nonNegative(irradianceMWcm2, 'irradiance (mW/cm²)') * nonNegative(seconds, 'exposure time (s)');
}

/** Seconds of exposure a lamp of this irradiance needs to deliver the dose. */
export function uvExposureSeconds(doseMJcm2: number, irradianceMWcm2: number): number {
  nonNegative(doseMJcm2, 'dose (mJ/cm²)');
  if (!(irradianceMWcm2 > 0)) throw new RangeError('irradiance must be above 0 mW/cm² to deliver a dose');
  return doseMJcm2 / irradianceMWcm2;
}

export interface HumidityReading {
  at: string;
  rhPct: number;
}

export interface HumidityCheck {
  ok: boolean;
  /** stretches of the cure spent outside the window */
  outside: { from: string; to: string; rhPct: number }[];
}

/**
 * Whether a cure between `from` and `to` ran inside the material's humidity window, with
 * readings held until the next (the reading in force at `from` counts; with no reading at all
 * the check cannot be made and reports nothing outside).
 */
export function humidityWindowCheck(
  window: { rhMinPct?: number | null; rhMaxPct?: number | null },
  from: string,
  to: string,
  readings: HumidityReading[],
): HumidityCheck {
  const min = window.rhMinPct ?? Number.NEGATIVE_INFINITY;
  const max = window.rhMaxPct ?? Number.POSITIVE_INFINITY;
  const fromMs = ms(from, 'from');
  const toMs = ms(to, 'to');
  if (readings.length === 0 || toMs <= fromMs) return { ok: true, outside: [] };
  const outside: HumidityCheck['outside'] = [];
  for (const s of stepSegments(fromMs, readings, (r) => r.rhPct)) {
    if (s.from >= toMs) break;
    if (s.value < min || s.value > max) {
      outside.push({ from: new Date(s.from).toISOString(), to: new Date(Math.min(s.to, toMs)).toISOString(), rhPct: s.value });
    }
  }
  return { ok: outside.length === 0, outside };
}

/**
 * The method that names a step using several adhesives: UV before heat before ambient (the one
 * with its own equipment); null when none has a cure profile.
 */
export function stepCureMethod(profiles: readonly ({ method?: CureMethod | null } | null | undefined)[]): CureMethod | null {
  const methods = new Set(profiles.filter((p) => !!p).map((p) => p?.method ?? 'ambient'));
  if (methods.size === 0) return null;
  return (['uv', 'heat', 'ambient'] as const).find((m) => methods.has(m)) ?? 'ambient';
}
