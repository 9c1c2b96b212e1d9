import { and, asc, count, eq, inArray } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { buildBatches, driverModels, recipeStepMaterials, recipeSteps } from '../../db/schema';
import { notFound } from '../../errors';
import type { DriverModel, RecipeStep } from '../../../shared/schemas/models';

type ModelRow = typeof driverModels.$inferSelect;

/** Recipe steps of the given models, ordered by seq, with their materials. */
export async function loadSteps(tx: DbOrTx, modelIds: string[]): Promise<Map<string, RecipeStep[]>> {
  const out = new Map<string, RecipeStep[]>(modelIds.map((id) => [id, []]));
  if (modelIds.length === 0) return out;
  const steps = await tx.select().from(recipeSteps).where(inArray(recipeSteps.modelId, modelIds)).orderBy(asc(recipeSteps.seq));
  const mats = steps.length
    ? await tx
        .select()
        .from(recipeStepMaterials)
        .where(
          inArray(
            recipeStepMaterials.stepId,
            steps.map((s) => s.id),
          ),
        )
    : [];
  for (const s of steps) {
    out.get(s.modelId)?.push({
      id: s.id,
      seq: s.seq,
      name: s.name,
      stationKind: s.stationKind,
      waitForCure: s.waitForCure,
      materials: mats.filter((m) => m.stepId === s.id).map((m) => ({ materialId: m.materialId, amountPerUnit: Number(m.amountPerUnit) })),
    });
  }
  return out;
}

/** How many build batches use each model revision (a revision with any is frozen). */
async function batchCounts(tx: DbOrTx, modelIds: string[]): Promise<Map<string, number>> {
  if (modelIds.length === 0) return new Map();
  const rows = await tx
    .select({ modelId: buildBatches.modelId, n: count() })
    .from(buildBatches)
    .where(inArray(buildBatches.modelId, modelIds))
    .groupBy(buildBatches.modelId);
  return new Map(rows.map((r) => [r.modelId, r.n]));
}

export async function toModels(tx: DbOrTx, rows: ModelRow[]): Promise<DriverModel[]> {
  const ids = rows.map((r) => r.id);
  const [steps, used] = await Promise.all([loadSteps(tx, ids), batchCounts(tx, ids)]);
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    name: r.name,
    description: r.description,
    active: r.active,
    steps: steps.get(r.id) ?? [],
    inUse: (used.get(r.id) ?? 0) > 0,
    batchCount: used.get(r.id) ?? 0,
    createdAt: r.createdAt.toISOString(),
    revision: r.revision,
    current: r.current,
  }));
}

export async function findModelRow(tx: DbOrTx, id: string, lock = false): Promise<ModelRow> {
  const q = tx.select().from(driverModels).where(eq(driverModels.id, id));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('The driver model');
  return row;
}

export async function getModel(id: string, tx: DbOrTx = db): Promise<DriverModel> {
  const [model] = await toModels(tx, [await findModelRow(tx, id)]);
  return model;
}

export async function listModels(query: {
  includeRetired: boolean;
  includeRevisions?: boolean;
  code?: string;
}): Promise<{ items: DriverModel[] }> {
  const rows = await db
    .select()
    .from(driverModels)
    .where(
      and(
        query.includeRetired ? undefined : eq(driverModels.active, true),
        query.includeRevisions ? undefined : eq(driverModels.current, true),
        query.code ? eq(driverModels.code, query.code) : undefined,
      ),
    )
    .orderBy(asc(driverModels.code), asc(driverModels.revision));
  return { items: await toModels(db, rows) };
}
