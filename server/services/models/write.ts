import { and, count, desc, eq, inArray, sql } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { buildBatches, driverModels, materials, recipeStepMaterials, recipeSteps, stations } from '../../db/schema';
import { conflict, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import {
  revisionLabel,
  type DriverModel,
  type DriverModelInput,
  type DriverModelPatch,
  type RecipeStepInput,
} from '../../../shared/schemas/models';
import { findModelRow, getModel, loadSteps } from './read';

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
      throw fieldError(
        `steps.${i}.stationKind`,
        `"${step.stationKind}" is not the kind of any active station; add the station first or use an existing kind`,
      );
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
      await tx
        .insert(recipeStepMaterials)
        .values(step.materials.map((m) => ({ stepId: row.id, materialId: m.materialId, amountPerUnit: String(m.amountPerUnit) })));
    }
  }
}

export async function createModel(actor: Actor, input: DriverModelInput): Promise<DriverModel> {
  requirePermission(actor, 'models.edit');
  // A new model comes with its recipe.
  requirePermission(actor, 'recipes.edit');
  return db.transaction(async (tx) => {
    await checkRecipe(tx, input.steps);
    // A code names one model across its revisions: any revision of it makes the code taken.
    const [taken] = await tx.select({ id: driverModels.id }).from(driverModels).where(eq(driverModels.code, input.code)).limit(1);
    const [row] = taken
      ? []
      : await tx
          .insert(driverModels)
          .values({ code: input.code, name: input.name, description: input.description ?? null })
          .onConflictDoNothing({ target: [driverModels.code, driverModels.revision] })
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
          `Build batches already use ${revisionLabel(before)}, so its steps cannot be replaced (the travelers point at them). Copy it as a new revision and change that.`,
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
    if (Object.keys(fields).length)
      await tx
        .update(driverModels)
        .set(fields)
        .where(and(eq(driverModels.id, id)));
    const after = await getModel(id, tx);
    await recordAudit(tx, { actorId: actor.id, action: 'model.update', entityType: 'driver_model', entityId: id, before, after });
    return after;
  });
}

/**
 * POST /api/models/:id/revisions: copies a revision's recipe (name, description, steps and
 * their materials) as the next revision of the same code. The copy is not current and no batch
 * uses it, so its steps can be edited; PATCH it, then make it current. One draft at a time.
 */
export async function createRevision(actor: Actor, id: string): Promise<DriverModel> {
  requirePermission(actor, 'recipes.edit');
  return db.transaction(async (tx) => {
    const source = await findModelRow(tx, id);
    // One writer per model code at a time, so two copies cannot take the same number.
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`model-revision:${source.code}`}))`);
    const revisions = await tx.select().from(driverModels).where(eq(driverModels.code, source.code)).orderBy(desc(driverModels.revision));
    const current = revisions.find((r) => r.current);
    const draft = revisions.find((r) => !r.current && current && r.revision > current.revision);
    if (draft) {
      throw conflict(
        'REVISION_DRAFT_EXISTS',
        `${revisionLabel(draft)} is already a draft of ${source.code}: change that one, or make it current first.`,
        { modelId: draft.id, revision: draft.revision },
      );
    }
    const next = (revisions[0]?.revision ?? source.revision) + 1;
    const [row] = await tx
      .insert(driverModels)
      .values({ code: source.code, name: source.name, description: source.description, active: true, revision: next, current: false })
      .returning();
    const steps = (await loadSteps(tx, [source.id])).get(source.id) ?? [];
    await insertSteps(
      tx,
      row.id,
      steps.map((s) => ({ seq: s.seq, name: s.name, stationKind: s.stationKind, waitForCure: s.waitForCure, materials: s.materials })),
    );
    const model = await getModel(row.id, tx);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'model.revise',
      entityType: 'driver_model',
      entityId: row.id,
      after: { ...model, copiedFrom: { id: source.id, revision: source.revision } },
    });
    return model;
  });
}

/** POST /api/models/:id/make-current: new batches of this code are built with this revision. */
export async function makeRevisionCurrent(actor: Actor, id: string): Promise<DriverModel> {
  requirePermission(actor, 'recipes.edit');
  return db.transaction(async (tx) => {
    const row = await findModelRow(tx, id);
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`model-revision:${row.code}`}))`);
    const [before] = await tx
      .select()
      .from(driverModels)
      .where(and(eq(driverModels.code, row.code), eq(driverModels.current, true)));
    if (before?.id === row.id) return getModel(id, tx);
    const [{ n }] = await tx.select({ n: count() }).from(recipeSteps).where(eq(recipeSteps.modelId, id));
    if (n === 0) throw conflict('MODEL_HAS_NO_STEPS', `${revisionLabel(row)} has no recipe steps yet; add them before making it current.`);
    await tx
      .update(driverModels)
      .set({ current: false })
      .where(and(eq(driverModels.code, row.code), eq(driverModels.current, true)));
    await tx.update(driverModels).set({ current: true }).where(eq(driverModels.id, id));
    const after = await getModel(id, tx);
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'model.makeCurrent',
      entityType: 'driver_model',
      entityId: id,
      before: before ? { currentRevision: before.revision, currentId: before.id } : null,
      after: { currentRevision: after.revision, currentId: after.id },
    });
    return after;
  });
}
