import { and, asc, eq, inArray, isNotNull } from 'drizzle-orm';
import { db } from '../../db/client';
import { drivers, materials, stations, stepRuns } from '../../db/schema';
import type { BatchDetail, StepCure, TravelerStep } from '../../../shared/schemas/batches';
import type { CureProfileJson } from '../../db/schema';
import { humidityOfRun } from '../cure/humidity';
import { stepCureMethod } from '../../../shared/cure-methods';
import { describeRuns } from '../steps/describe';
import { cureOfRun, profilesForRuns } from '../cure/compute';
import { findBatch } from './read';
import { batchProgress } from './progress';

/**
 * How a step's adhesives cure, from the recipe's materials' profiles: UV before heat before
 * ambient when a step uses several (the one with its own equipment names the step); the
 * highest UV dose, the narrowest humidity window.
 */
export function stepCureOf(profiles: (CureProfileJson | null)[]): StepCure | null {
  const ps = profiles.filter((p): p is CureProfileJson => !!p);
  if (ps.length === 0) return null;
  const method = stepCureMethod(ps) ?? 'ambient';
  const of = ps.filter((p) => (p.method ?? 'ambient') === method);
  const nums = (xs: (number | undefined)[]) => xs.filter((x): x is number => typeof x === 'number');
  const doses = nums(of.map((p) => p.uvDoseMJcm2));
  const mins = nums(ps.map((p) => p.minTempC));
  const rhMin = nums(ps.map((p) => p.rhMinPct));
  const rhMax = nums(ps.map((p) => p.rhMaxPct));
  return {
    method,
    uvDoseMJcm2: doses.length ? Math.max(...doses) : null,
    minTempC: mins.length ? Math.max(...mins) : null,
    schedule: method === 'heat' ? [...(of.find((p) => p.schedule?.length)?.schedule ?? [])].sort((a, b) => a.tempC - b.tempC) : [],
    rhMinPct: rhMin.length ? Math.max(...rhMin) : null,
    rhMaxPct: rhMax.length ? Math.min(...rhMax) : null,
  };
}

/** GET /api/batches/:id — the traveler: every step with its state, run and cure (recomputed now). */
export async function getBatchDetail(id: string, now: Date = new Date()): Promise<BatchDetail> {
  const { row, batch } = await findBatch(db, id);
  const progress = await batchProgress(db, row);
  const materialIds = [...new Set(progress.steps.flatMap((s) => s.materials.map((m) => m.materialId)))];
  const mats = materialIds.length
    ? await db
        .select({
          id: materials.id,
          code: materials.code,
          name: materials.name,
          unit: materials.unit,
          partnerMaterialId: materials.partnerMaterialId,
          cure: materials.cure,
        })
        .from(materials)
        .where(inArray(materials.id, materialIds))
    : [];
  const buildRunRows = [...progress.buildRuns.values()];
  const reworkRows = await db
    .select()
    .from(stepRuns)
    .where(and(eq(stepRuns.batchId, row.id), isNotNull(stepRuns.driverId)))
    .orderBy(asc(stepRuns.startedAt));
  const [buildRuns, reworkRuns] = await Promise.all([describeRuns(db, buildRunRows), describeRuns(db, reworkRows)]);
  const profiles = await profilesForRuns(
    db,
    buildRunRows.filter((r) => r.finishedAt).map((r) => r.id),
  );
  const areas = new Map(
    buildRunRows.length
      ? (
          await db
            .select({ id: stations.id, area: stations.area })
            .from(stations)
            .where(
              inArray(
                stations.id,
                buildRunRows.map((r) => r.stationId),
              ),
            )
        ).map((s) => [s.id, s.area])
      : [],
  );

  const steps: TravelerStep[] = [];
  for (const s of progress.steps) {
    const runRow = progress.buildRuns.get(s.id);
    const run = buildRuns.find((r) => r.stepId === s.id) ?? null;
    let state: TravelerStep['state'] = 'pending';
    let handlingAt: string | null = null;
    let cureCompleteAt: string | null = null;
    let humidity: TravelerStep['humidity'] = null;
    if (runRow && !runRow.finishedAt) state = 'running';
    if (runRow?.finishedAt) {
      const area = areas.get(runRow.stationId) ?? '';
      const runProfiles = profiles.get(runRow.id) ?? [];
      const cure = await cureOfRun(db, { finishedAt: runRow.finishedAt, area, stationId: runRow.stationId }, runProfiles, now);
      handlingAt = cure?.handlingAt ?? null;
      cureCompleteAt = cure?.cureCompleteAt ?? null;
      state = cure && (cure.cureCompleteAt === null || Date.parse(cure.cureCompleteAt) > now.getTime()) ? 'curing' : 'done';
      const h = await humidityOfRun(
        db,
        { finishedAt: runRow.finishedAt, cureCompleteAt: cureCompleteAt ? new Date(cureCompleteAt) : null, area },
        runProfiles,
        now,
      );
      humidity = h ? { ...h, area } : null;
    }
    steps.push({
      id: s.id,
      seq: s.seq,
      name: s.name,
      stationKind: s.stationKind,
      waitForCure: s.waitForCure,
      materials: s.materials.map((m) => {
        const mat = mats.find((x) => x.id === m.materialId);
        return {
          materialId: m.materialId,
          materialCode: mat?.code ?? '',
          materialName: mat?.name ?? '',
          unit: mat?.unit ?? '',
          amountPerUnit: m.amountPerUnit,
          twoPart: !!mat?.partnerMaterialId,
          cureMethod: mat?.cure ? (mat.cure.method ?? 'ambient') : null,
        };
      }),
      state,
      run,
      handlingAt,
      cureCompleteAt,
      cure: stepCureOf(s.materials.map((m) => mats.find((x) => x.id === m.materialId)?.cure ?? null)),
      humidity,
    });
  }
  const driverRows = await db
    .select({ id: drivers.id, serial: drivers.serial, status: drivers.status })
    .from(drivers)
    .where(eq(drivers.batchId, row.id))
    .orderBy(asc(drivers.serial));
  return { batch, steps, currentStepId: progress.pending[0]?.id ?? null, drivers: driverRows, reworkRuns };
}
