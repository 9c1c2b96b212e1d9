import { and, eq, gt, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials, mixes, stations, stepRunMaterials, type CureProfileJson } from '../../db/schema';
import { cureProgress, cureTimes, type CureProfile, type Reading } from '../../../shared/cure';
import { methodCureTimes, type MethodCureProfile } from '../../../shared/cure-methods';
import { historiesFor, stationHistoriesFor } from './readings';

export interface RunCure {
  /** null while the cure makes no progress at the last temperature recorded (below its minimum, or an oven with no reading) */
  handlingAt: string | null;
  cureCompleteAt: string | null;
  /** 0..1 of full cure at `now` (the slowest adhesive). */
  progress: number;
  /** Where the temperatures came from: the area's air, or the station's own readings (an oven). */
  environment: 'area' | 'own';
  /** Minutes the cure spent below an adhesive's minimum cure temperature (ambient with minTempC). */
  minutesBelowMin: number;
}

function asProfile(c: CureProfileJson | null): CureProfile | null {
  if (!c || !(c.fullCureMinutes >= 0) || !(c.handlingMinutes >= 0)) return null;
  return c;
}

/**
 * Cure profiles of the adhesives each run actually drew from (quantity used > 0): a container's
 * material, or a mix's resin (its hardener's profile when the resin has none).
 */
export async function profilesForRuns(tx: DbOrTx, runIds: string[]): Promise<Map<string, CureProfile[]>> {
  const out = new Map<string, CureProfile[]>(runIds.map((id) => [id, []]));
  if (runIds.length === 0) return out;
  const used = and(inArray(stepRunMaterials.stepRunId, runIds), gt(stepRunMaterials.quantityUsed, '0'));
  const direct = await tx
    .select({ runId: stepRunMaterials.stepRunId, cure: materials.cure })
    .from(stepRunMaterials)
    .innerJoin(containers, eq(containers.id, stepRunMaterials.containerId))
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(used);
  const viaMix = await tx
    .select({ runId: stepRunMaterials.stepRunId, resin: mixes.resinContainerId, hardener: mixes.hardenerContainerId })
    .from(stepRunMaterials)
    .innerJoin(mixes, eq(mixes.id, stepRunMaterials.mixId))
    .where(used);
  const partIds = [...new Set(viaMix.flatMap((m) => [m.resin, m.hardener]))];
  const partCure = new Map(
    partIds.length
      ? (
          await tx
            .select({ id: containers.id, cure: materials.cure })
            .from(containers)
            .innerJoin(lots, eq(lots.id, containers.lotId))
            .innerJoin(materials, eq(materials.id, lots.materialId))
            .where(inArray(containers.id, partIds))
        ).map((r) => [r.id, r.cure])
      : [],
  );
  for (const d of direct) {
    const p = asProfile(d.cure);
    if (p) out.get(d.runId)!.push(p);
  }
  for (const m of viaMix) {
    const p = asProfile(partCure.get(m.resin) ?? null) ?? asProfile(partCure.get(m.hardener) ?? null);
    if (p) out.get(m.runId)!.push(p);
  }
  return out;
}

/** Whether a profile needs the method-aware computation (shared/cure-methods.ts). */
function usesMethod(p: MethodCureProfile): boolean {
  return (p.method ?? 'ambient') !== 'ambient' || (p.minTempC !== undefined && p.minTempC !== null);
}

/**
 * The cure of one adhesive from `start` over a history. Room-temperature cures without a minimum
 * keep shared/cure.ts (its progress is exact); heat and minimum-temperature cures go through
 * methodCureTimes, with progress as the share of the time from start to full cure that has
 * passed (an estimate shown on the board; the gate decides on fullCureAt). A UV adhesive is cured
 * by its dose at the finish (the finish refuses a short dose), so it is done at `start`.
 */
function oneCure(p: MethodCureProfile, start: string, history: Reading[] | null, now: string): Omit<RunCure, 'environment'> {
  const method = p.method ?? 'ambient';
  if (method === 'uv') return { handlingAt: start, cureCompleteAt: start, progress: 1, minutesBelowMin: 0 };
  if (history === null || history.length === 0) return { handlingAt: null, cureCompleteAt: null, progress: 0, minutesBelowMin: 0 };
  if (!usesMethod(p)) {
    const t = cureTimes(p, start, history);
    return { handlingAt: t.handlingAt, cureCompleteAt: t.fullCureAt, progress: cureProgress(p, start, history, now), minutesBelowMin: 0 };
  }
  const t = methodCureTimes(p, start, history, now);
  const startMs = Date.parse(start);
  const nowMs = Date.parse(now);
  let progress = 0;
  if (t.fullCureAt !== null) {
    const span = Date.parse(t.fullCureAt) - startMs;
    progress = span <= 0 || nowMs >= startMs + span ? 1 : Math.max(0, (nowMs - startMs) / span);
  }
  return { handlingAt: t.handlingAt, cureCompleteAt: t.fullCureAt, progress, minutesBelowMin: t.minutesBelowMin };
}

const later = (a: string | null, b: string | null): string | null =>
  a === null || b === null ? null : Date.parse(a) >= Date.parse(b) ? a : b;

/**
 * When a finished run's adhesives may be handled and are fully cured, integrated from the finish
 * on over the readings of the place they cure (the slowest adhesive decides): the station's own
 * readings when its cure environment is 'own' (an oven), else its area's. Null when none has a
 * profile. This one computation serves the finish, the start gate, the cure board, the batch page
 * and the final-test gate.
 */
export async function cureOfRun(
  tx: DbOrTx,
  run: { finishedAt: Date; area: string; stationId?: string },
  profiles: CureProfile[],
  now: Date,
): Promise<RunCure | null> {
  if (profiles.length === 0) return null;
  let environment: 'area' | 'own' = 'area';
  if (run.stationId) {
    const [st] = await tx.select({ env: stations.cureEnvironment }).from(stations).where(eq(stations.id, run.stationId));
    if (st?.env === 'own') environment = 'own';
  }
  const histories: (Reading[] | null)[] =
    environment === 'own'
      ? await stationHistoriesFor(tx, run.stationId as string, run.finishedAt, profiles.length)
      : await historiesFor(tx, run.area, run.finishedAt, profiles);
  const start = run.finishedAt.toISOString();
  let best: RunCure | null = null;
  profiles.forEach((p, i) => {
    const c = oneCure(p as MethodCureProfile, start, histories[i], now.toISOString());
    if (!best) best = { ...c, environment };
    else {
      best.handlingAt = later(best.handlingAt, c.handlingAt);
      best.cureCompleteAt = later(best.cureCompleteAt, c.cureCompleteAt);
      best.progress = Math.min(best.progress, c.progress);
      best.minutesBelowMin = Math.max(best.minutesBelowMin, c.minutesBelowMin);
    }
  });
  return best;
}
