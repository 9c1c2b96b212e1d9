import { and, eq, gt, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials, mixes, stepRunMaterials, type CureProfileJson } from '../../db/schema';
import { cureProgress, cureTimes, type CureProfile } from '../../../shared/cure';
import { historiesFor } from './readings';

export interface RunCure {
  handlingAt: string;
  cureCompleteAt: string;
  /** 0..1 of full cure at `now` (the slowest adhesive). */
  progress: number;
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

/**
 * When a finished run's adhesives may be handled and are fully cured, integrated over the
 * area's readings from the finish on (the slowest adhesive decides). Null when none has a profile.
 */
export async function cureOfRun(
  tx: DbOrTx,
  run: { finishedAt: Date; area: string },
  profiles: CureProfile[],
  now: Date,
): Promise<RunCure | null> {
  if (profiles.length === 0) return null;
  const histories = await historiesFor(tx, run.area, run.finishedAt, profiles);
  const start = run.finishedAt.toISOString();
  let best: RunCure | null = null;
  profiles.forEach((p, i) => {
    const t = cureTimes(p, start, histories[i]);
    const progress = cureProgress(p, start, histories[i], now.toISOString());
    if (!best) best = { handlingAt: t.handlingAt, cureCompleteAt: t.fullCureAt, progress };
    else {
      if (Date.parse(t.handlingAt) > Date.parse(best.handlingAt)) best.handlingAt = t.handlingAt;
      if (Date.parse(t.fullCureAt) > Date.parse(best.cureCompleteAt)) best.cureCompleteAt = t.fullCureAt;
      best.progress = Math.min(best.progress, progress);
    }
  });
  return best;
}
