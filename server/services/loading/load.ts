import { and, eq, inArray, isNull } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { containers, drivers, materials, stationLoads, stepRunMaterials, stepRuns } from '../../db/schema';
import { AppError, conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { findStation } from '../stations';
import { findBatch } from '../batches/read';
import { batchProgress, checkBatchOpen } from '../batches/progress';
import type { LoadInput, LoadResult } from '../../../shared/schemas/station-loads';
import type { RecipeStep } from '../../../shared/schemas/models';
import { containerByCode, mixByCode } from './context';
import { checkContainerUsable, checkMixUsable, type MaterialRow } from './usability';
import { describeLoads } from './describe';
import { stationKindWords } from '../../../shared/words';

const kindWords = (kind: string) => stationKindWords(kind).toLowerCase();

type StationRow = Awaited<ReturnType<typeof findStation>>;

/** The step of the batch this station would run next; WRONG_STATION when the batch has none here. */
export function stepAtStation(station: StationRow, batchCode: string, pending: RecipeStep[]): RecipeStep {
  const step = pending.find((s) => s.stationKind === station.kind);
  if (!step) {
    const next = pending[0];
    throw conflict(
      'WRONG_STATION',
      next
        ? `Batch ${batchCode} has no step left at a ${kindWords(station.kind)} station (${station.code}); its next step is "${next.name}" at a ${kindWords(next.stationKind)} station. Take the batch there.`
        : `Batch ${batchCode} has finished all its steps; nothing more runs at ${station.code}.`,
      { stationKind: station.kind, nextStepId: next?.id ?? null },
    );
  }
  return step;
}

/**
 * A rework load: the driver must belong to the batch and have failed (or be under rework); the
 * step is the one named, or the first of the recipe run at this station's kind.
 */
async function reworkStep(tx: Tx, station: StationRow, batch: { id: string; code: string }, steps: RecipeStep[], serial: string, stepId?: string): Promise<RecipeStep> {
  const [driver] = await tx.select().from(drivers).where(eq(drivers.serial, serial));
  if (!driver) throw new AppError('NOT_FOUND', `No driver has the serial "${serial}".`, 404, [{ field: 'serial', message: 'is not known' }]);
  if (driver.batchId !== batch.id) {
    throw conflict('WRONG_BATCH', `Driver ${driver.serial} belongs to another batch, not ${batch.code}. Scan the driver's own batch.`);
  }
  if (driver.status !== 'failed' && driver.status !== 'reworked') {
    throw conflict('NOT_FOR_REWORK', `Driver ${driver.serial} is ${driver.status.replace('_', ' ')}; only a driver that failed final test is reworked.`);
  }
  const step = stepId ? steps.find((s) => s.id === stepId) : steps.find((s) => s.stationKind === station.kind);
  if (!step) {
    if (stepId) throw new AppError('NOT_FOUND', 'That recipe step is not part of this batch\'s model.', 404, [{ field: 'stepId', message: 'is not a step of this model' }]);
    throw conflict('WRONG_STATION', `No step of batch ${batch.code}'s recipe runs at a ${kindWords(station.kind)} station (${station.code}).`, { stationKind: station.kind });
  }
  if (step.stationKind !== station.kind) {
    throw conflict('WRONG_STATION', `Step "${step.name}" runs at a ${kindWords(step.stationKind)} station, not at ${station.code} (${kindWords(station.kind)}).`, { stationKind: station.kind });
  }
  return step;
}

async function namesOf(tx: Tx, ids: string[]): Promise<string> {
  const rows = ids.length ? await tx.select({ id: materials.id, name: materials.name }).from(materials).where(inArray(materials.id, ids)) : [];
  const names = ids.map((id) => rows.find((r) => r.id === id)?.name ?? id);
  return names.length ? names.join(' or ') : 'no material';
}

/** WRONG_MATERIAL unless one of the scanned materials is in the step's recipe. */
async function checkMaterialForStep(tx: Tx, step: RecipeStep, scanned: MaterialRow[], what: string): Promise<void> {
  const wanted = step.materials.map((m) => m.materialId);
  if (scanned.some((m) => wanted.includes(m.id))) return;
  throw conflict(
    'WRONG_MATERIAL',
    `Wrong material: ${what} is ${scanned.map((m) => m.name).join(' + ')}, but step "${step.name}" uses ${await namesOf(tx, wanted)}. Take it out and load the right material.`,
    { scannedMaterialIds: scanned.map((m) => m.id), expectedMaterialIds: wanted, stepId: step.id },
  );
}

/**
 * POST /api/stations/:id/load — checks everything first (a refusal changes nothing), then opens
 * a sealed container (its after-opening life starts now) and records the load.
 */
export async function loadAtStation(actor: Actor, stationId: string, input: LoadInput, now: Date = new Date()): Promise<LoadResult> {
  requirePermission(actor, 'stations.load');
  return db.transaction(async (tx) => {
    const station = await findStation(tx, stationId);
    if (!station.active) {
      throw conflict('STATION_RETIRED', `Station ${station.code} is retired; nothing can be loaded there. Use an active station.`);
    }
    const { row: batch } = await findBatch(tx, input.batchId);
    checkBatchOpen(batch, Boolean(input.serial));
    const progress = await batchProgress(tx, batch);
    const step = input.serial
      ? await reworkStep(tx, station, batch, progress.steps, input.serial, input.stepId)
      : stepAtStation(station, batch.code, progress.pending);

    let containerId: string | null = null;
    let mixId: string | null = null;
    let opened = false;
    if (input.containerCode) {
      const c = await containerByCode(tx, input.containerCode, 'containerCode', true);
      await checkMaterialForStep(tx, step, [c.material], `container ${c.container.code}`);
      checkContainerUsable(c.container, c.lot, c.material, now);
      containerId = c.container.id;
      if (c.container.status === 'sealed') {
        // Only the load that finds it still sealed opens it (a racing load must not move openedAt).
        const openedRows = await tx
          .update(containers)
          .set({ status: 'open', openedAt: now, updatedAt: now })
          .where(and(eq(containers.id, c.container.id), eq(containers.status, 'sealed')))
          .returning({ id: containers.id });
        opened = openedRows.length === 1;
      }
      if (opened) {
        await recordAudit(tx, {
          actorId: actor.id,
          action: 'container.open',
          entityType: 'container',
          entityId: c.container.id,
          before: { status: 'sealed', openedAt: null },
          after: { status: 'open', openedAt: now.toISOString() },
          reason: `loaded at station ${station.code}`,
        });
      }
    } else {
      const m = await mixByCode(tx, input.mixCode!, 'mixCode');
      await checkMaterialForStep(tx, step, [m.resin.material, m.hardener.material], `mix ${m.mix.code}`);
      checkMixUsable(m.mix, [m.resin, m.hardener], now);
      mixId = m.mix.id;
    }

    const same = and(
      eq(stationLoads.stationId, station.id),
      eq(stationLoads.batchId, batch.id),
      isNull(stationLoads.unloadedAt),
      containerId ? eq(stationLoads.containerId, containerId) : eq(stationLoads.mixId, mixId!),
    );
    let [load] = await tx.select().from(stationLoads).where(same);
    const alreadyLoaded = Boolean(load);
    if (!load) {
      [load] = await tx
        .insert(stationLoads)
        .values({ stationId: station.id, batchId: batch.id, containerId, mixId, loadedAt: now, loadedBy: actor.id })
        .returning();
      await recordAudit(tx, {
        actorId: actor.id,
        action: 'station.load',
        entityType: 'station_load',
        entityId: load.id,
        after: { stationId: station.id, batchId: batch.id, containerId, mixId, loadedAt: now.toISOString() },
      });
      // A container swapped in while a step runs here belongs to that run's genealogy too.
      const running = await tx
        .select({ id: stepRuns.id })
        .from(stepRuns)
        .where(and(eq(stepRuns.batchId, batch.id), eq(stepRuns.stationId, station.id), isNull(stepRuns.finishedAt)));
      for (const run of running) {
        await tx.insert(stepRunMaterials).values({ stepRunId: run.id, containerId, mixId, loadedAt: now, loadedBy: actor.id });
      }
    }
    const [described] = await describeLoads(tx, [load], now);
    return { ...described, accepted: true as const, step: { id: step.id, seq: step.seq, name: step.name }, opened, alreadyLoaded };
  });
}
