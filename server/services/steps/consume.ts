/**
 * Consumption at a step's finish: amountPerUnit × units of every recipe material, drawn
 * first-expiry-first-out from what the run used. Rows are locked (SELECT … FOR UPDATE, in id
 * order so concurrent finishes cannot deadlock) and every decrement is conditional, so
 * concurrent finishes never spend the same stock twice and nothing goes below zero.
 */
import { and, asc, eq, inArray, isNull, notInArray, sql } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { containers, lots, materials, mixes, stationLoads, stepRunMaterials } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import type { RecipeStep } from '../../../shared/schemas/models';
import { fefoOrder } from '../../../shared/expiry';
import { containersByIds, expiryOfContainer, expiryOfMix, mixesByIds } from '../loading';

const milli = (v: string | number) => Math.round(Number(v) * 1000);
const fromMilli = (m: number) => (m / 1000).toFixed(3);

interface Source {
  runMaterialId: string;
  kind: 'container' | 'mix';
  id: string;
  code: string;
  materialIds: string[];
  expiry: string | null;
  receivedAt: string;
  seq: number;
}

async function sourcesOf(tx: Tx, runId: string, now: Date): Promise<Source[]> {
  const rows = await tx
    .select()
    .from(stepRunMaterials)
    .where(eq(stepRunMaterials.stepRunId, runId))
    .orderBy(asc(stepRunMaterials.loadedAt));
  const containerIds = [...new Set(rows.flatMap((r) => (r.containerId ? [r.containerId] : [])))].sort();
  const mixIds = [...new Set(rows.flatMap((r) => (r.mixId ? [r.mixId] : [])))].sort();
  // Lock in a fixed order: containers by id, then mixes by id.
  if (containerIds.length)
    await tx
      .select({ id: containers.id })
      .from(containers)
      .where(inArray(containers.id, containerIds))
      .orderBy(asc(containers.id))
      .for('update');
  if (mixIds.length) await tx.select({ id: mixes.id }).from(mixes).where(inArray(mixes.id, mixIds)).orderBy(asc(mixes.id)).for('update');
  const cs = await containersByIds(tx, containerIds);
  const ms = await mixesByIds(tx, mixIds);
  const seen = new Set<string>();
  const out: Source[] = [];
  for (const r of rows) {
    const key = r.containerId ?? r.mixId!;
    if (seen.has(key)) continue;
    seen.add(key);
    if (r.containerId) {
      const c = cs.get(r.containerId)!;
      out.push({
        runMaterialId: r.id,
        kind: 'container',
        id: c.container.id,
        code: c.container.code,
        materialIds: [c.material.id],
        expiry: expiryOfContainer(c.container, c.lot, c.material, now).at,
        receivedAt: c.lot.receivedAt.toISOString(),
        seq: c.container.seq,
      });
    } else {
      const m = ms.get(r.mixId!)!;
      out.push({
        runMaterialId: r.id,
        kind: 'mix',
        id: m.mix.id,
        code: m.mix.code,
        materialIds: [m.resin.material.id, m.hardener.material.id],
        expiry: expiryOfMix(m.mix, [m.resin, m.hardener]).at,
        receivedAt: m.mix.mixedAt.toISOString(),
        seq: 0,
      });
    }
  }
  return out;
}

async function remainingOf(tx: Tx, s: Source): Promise<number> {
  const table = s.kind === 'container' ? containers : mixes;
  const [row] = await tx.select({ remaining: table.remaining }).from(table).where(eq(table.id, s.id));
  return milli(row.remaining);
}

/** Takes `amount` (thousandths) from one container or mix; empty ones are marked and taken off every station. */
async function draw(tx: Tx, actor: Actor, s: Source, amount: number, now: Date): Promise<void> {
  const qty = fromMilli(amount);
  if (s.kind === 'container') {
    const [row] = await tx
      .update(containers)
      .set({
        remaining: sql`${containers.remaining} - ${qty}::numeric`,
        status: sql`CASE WHEN ${containers.remaining} - ${qty}::numeric = 0 THEN 'empty'::container_status ELSE ${containers.status} END`,
        updatedAt: now,
      })
      .where(and(eq(containers.id, s.id), sql`${containers.remaining} >= ${qty}::numeric`))
      .returning({ remaining: containers.remaining, status: containers.status, lotId: containers.lotId });
    if (!row) throw conflict('INSUFFICIENT_STOCK', `Container ${s.code} no longer holds ${qty}; load more and finish again.`);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'container.consume',
      entityType: 'container',
      entityId: s.id,
      before: { remaining: fromMilli(milli(row.remaining) + amount) },
      after: { remaining: row.remaining, status: row.status },
    });
    if (row.status === 'empty') {
      await tx
        .update(stationLoads)
        .set({ unloadedAt: now })
        .where(and(eq(stationLoads.containerId, s.id), isNull(stationLoads.unloadedAt)));
      await markLotUsedUp(tx, actor, row.lotId);
    }
  } else {
    const [row] = await tx
      .update(mixes)
      .set({
        remaining: sql`${mixes.remaining} - ${qty}::numeric`,
        status: sql`CASE WHEN ${mixes.remaining} - ${qty}::numeric = 0 THEN 'used_up'::mix_status ELSE ${mixes.status} END`,
      })
      .where(and(eq(mixes.id, s.id), sql`${mixes.remaining} >= ${qty}::numeric`))
      .returning({ remaining: mixes.remaining, status: mixes.status });
    if (!row) throw conflict('INSUFFICIENT_STOCK', `Mix ${s.code} no longer holds ${qty}; mix more and finish again.`);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'mix.consume',
      entityType: 'mix',
      entityId: s.id,
      before: { remaining: fromMilli(milli(row.remaining) + amount) },
      after: { remaining: row.remaining, status: row.status },
    });
    if (row.status === 'used_up') {
      await tx
        .update(stationLoads)
        .set({ unloadedAt: now })
        .where(and(eq(stationLoads.mixId, s.id), isNull(stationLoads.unloadedAt)));
    }
  }
}

/** A released lot whose containers are all empty or scrapped is used up. */
async function markLotUsedUp(tx: Tx, actor: Actor, lotId: string): Promise<void> {
  const [left] = await tx
    .select({ id: containers.id })
    .from(containers)
    .where(and(eq(containers.lotId, lotId), notInArray(containers.status, ['empty', 'scrapped'])))
    .limit(1);
  if (left) return;
  const [lot] = await tx
    .update(lots)
    .set({ status: 'used_up' })
    .where(and(eq(lots.id, lotId), eq(lots.status, 'released')))
    .returning({ id: lots.id });
  if (lot) {
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'lot.status',
      entityType: 'lot',
      entityId: lotId,
      before: { status: 'released' },
      after: { status: 'used_up' },
      reason: 'every container empty',
    });
  }
}

/** Draws the step's recipe for `units` units; returns nothing, throws INSUFFICIENT_STOCK / MATERIAL_NOT_LOADED. */
export async function consumeForRun(
  tx: Tx,
  actor: Actor,
  runId: string,
  step: RecipeStep,
  units: number,
  batchCode: string,
  now: Date,
): Promise<void> {
  const sources = await sourcesOf(tx, runId, now);
  const names = new Map(
    step.materials.length
      ? (
          await tx
            .select({ id: materials.id, name: materials.name, unit: materials.unit })
            .from(materials)
            .where(
              inArray(
                materials.id,
                step.materials.map((m) => m.materialId),
              ),
            )
        ).map((m) => [m.id, m])
      : [],
  );
  for (const line of step.materials) {
    const mat = names.get(line.materialId)!;
    const need = milli(line.amountPerUnit * units);
    const candidates = fefoOrder(sources.filter((s) => s.materialIds.includes(line.materialId)));
    if (candidates.length === 0) {
      throw conflict(
        'MATERIAL_NOT_LOADED',
        `Nothing of ${mat.name} is loaded for batch ${batchCode} at this station; step "${step.name}" needs ${fromMilli(need)} ${mat.unit}. Load it and finish again.`,
        { materialId: line.materialId },
      );
    }
    const plan: [Source, number][] = [];
    let left = need;
    let available = 0;
    for (const s of candidates) {
      // Re-read under the lock: earlier lines of this recipe may have drawn from the same mix.
      const have = await remainingOf(tx, s);
      available += Math.max(0, have);
      const take = Math.min(left, Math.max(0, have));
      if (take > 0) plan.push([s, take]);
      left -= take;
      if (left === 0) break;
    }
    if (left > 0) {
      throw conflict(
        'INSUFFICIENT_STOCK',
        `Not enough ${mat.name} loaded for batch ${batchCode}: step "${step.name}" needs ${fromMilli(need)} ${mat.unit} (${line.amountPerUnit} × ${units}), the loaded stock holds ${fromMilli(available)} ${mat.unit}. Load another container and finish again.`,
        { materialId: line.materialId, needed: need / 1000, available: available / 1000 },
      );
    }
    for (const [s, take] of plan) {
      await draw(tx, actor, s, take, now);
      await tx
        .update(stepRunMaterials)
        .set({ quantityUsed: sql`${stepRunMaterials.quantityUsed} + ${fromMilli(take)}::numeric` })
        .where(eq(stepRunMaterials.id, s.runMaterialId));
    }
  }
}
