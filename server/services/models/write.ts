import { and, eq, inArray } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { buildBatches, driverModels, materials, recipeStepMaterials, recipeSteps, stations } from '../../db/schema';
import { conflict, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { DriverModel, DriverModelInput, DriverModelPatch, RecipeStepInput } from '../../../shared/schemas/models';
import { findModelRow, getModel } from './read';

/**
 * Checks a recipe against the plant: every step's station kind is run by some active station,
 * every material exists. A 400 names the first offending field (steps.N.…).
 */
async function checkRecipe(tx: Tx, steps: RecipeStepInput[]): Promise<void> {
  const kinds = new Set(
    (await tx.selectDistinct({ kind: stations.kind }).from(stations).where(eq(stations.active, true))).map((r) => r.kind),
  );
  const materialIds = [...new Set(steps.flatMap((s) => s.materials.map((m) => m.materialId)))];
  const known = new Set(
    materialIds.length
      ? (await tx.select({ id: materials.id }).from(materials).where(inArray(materials.id, materialIds))).map((r) => r.id)
      : [],
  );
  for (const [i, step] of steps.entries()) {
    if (!kinds.has(step.stationKind)) {
      throw fieldError(`steps.${i}.stationKind`, `"${step.stationKind}" is not the kind of any active station; add the station first or use an existing kind`);
    }
    for (const [j, m] of step.materials.entries()) {
      if (!known.has(m.materialId)) throw fieldError(`steps.${i}.materials.${j}.materialId`, 'is not a material in the catalogue');
    }
  }
}

async function insertSteps(tx: Tx, modelId: string, steps: RecipeStepInput[]): Promise<void> {
  for (const [i, step] of steps.entries()) {
    const [row] = await tx
      .insert(recipeSteps)
      .values({ modelId, seq: step.seq ?? i + 1, name: step.name, stationKind: step.stationKind, waitForCure: step.waitForCure })
      .returning({ id: recipeSteps.id });
    if (step.materials.length) {
      await tx.insert(recipeStepMaterials).values(
        step.materials.map((m) => ({ stepId: row.id, materialId: m.materialId, amountPerUnit: String(m.amountPerUnit) })),
      );
    }
  }
}

export async function createModel(actor: Actor, input: DriverModelInput): Promise<DriverModel> {
  requirePermission(actor, 'models.edit');
  // A new model comes with its recipe.
  requirePermission(actor, 'recipes.edit');
  return db.transaction(async (tx) => {
    await checkRecipe(tx, input.steps);
    const [row] = await tx
      .insert(driverModels)
      .values({ code: input.code, name: input.name, description: input.description ?? null })
      .onConflictDoNothing({ target: driverModels.code })
      .returning();
    if (!row) {
      throw conflict('DUPLICATE_CODE', `A driver model with the code "${input.code}" already exists; choose another code.`, [
        { field: 'code', message: 'is already used' },
      ]);
    }
    await insertSteps(tx, row.id, input.steps);
    const model = await getModel(row.id, tx);
    await recordAudit(tx, { actorId: actor.id, action: 'model.create', entityType: 'driver_model', entityId: row.id, after: model });
    return model;
  });
}

export async function updateModel(actor: Actor, id: string, patch: DriverModelPatch): Promise<DriverModel> {
  requirePermission(actor, 'models.edit');
  if (patch.steps) requirePermission(actor, 'recipes.edit');
  return db.transaction(async (tx) => {
    await findModelRow(tx, id, true);
    const before = await getModel(id, tx);
    if (patch.steps) {
      const [used] = await tx.select({ id: buildBatches.id }).from(buildBatches).where(eq(buildBatches.modelId, id)).limit(1);
      if (used) {
        throw conflict(
          'MODEL_IN_USE',
          `Build batches already use ${before.code}, so its steps cannot be replaced (the travelers point at them). Create a new model for the changed recipe.`,
        );
      }
      await checkRecipe(tx, patch.steps);
      await tx.delete(recipeSteps).where(eq(recipeSteps.modelId, id));
      await insertSteps(tx, id, patch.steps);
    }
    const fields = {
      ...(patch.name !== undefined ? { name: patch.name } : {}),
      ...(patch.description !== undefined ? { description: patch.description ?? null } : {}),
      ...(patch.active !== undefined ? { active: patch.active } : {}),
    };
    if (Object.keys(fields).length) await tx.update(driverModels).set(fields).where(and(eq(driverModels.id, id)));
    const after = await getModel(id, tx);
    await recordAudit(tx, { actorId: actor.id, action: 'model.update', entityType: 'driver_model', entityId: id, before, after });
    return after;
  });
}
