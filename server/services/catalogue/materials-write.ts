import { and, eq, ne } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { materials } from '../../db/schema';
import { badRequest, conflict } from '../../errors';
import { zodIssues } from '../../middleware/errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { materialInputSchema, type Material, type MaterialPatch, type MaterialValues } from '../../../shared/schemas/materials';
import { findMaterial, toMaterial, type MaterialRow } from './materials-read';
import { checkPartner, relinkPartners } from './partners';

const numeric = (n: number | null | undefined) => (n === null || n === undefined ? null : String(n));

/** Column values for a validated material. */
function columns(v: MaterialValues) {
  return {
    code: v.code,
    name: v.name,
    kind: v.kind,
    unit: v.unit,
    storageClass: v.storageClass,
    shelfLifeDays: v.shelfLifeDays ?? null,
    openLifeHours: v.openLifeHours ?? null,
    thawedLifeHours: v.thawedLifeHours ?? null,
    outOfStorageAllowanceHours: v.outOfStorageAllowanceHours ?? null,
    potLifeMinutes: v.potLifeMinutes ?? null,
    partnerMaterialId: v.partnerMaterialId ?? null,
    mixRatio: numeric(v.mixRatio),
    cure: v.cure ?? null,
    requiresInspection: v.requiresInspection,
    hazards: {
      ...(v.hazards.signalWord ? { signalWord: v.hazards.signalWord } : {}),
      pictograms: v.hazards.pictograms,
      statements: v.hazards.statements,
    },
    gtin: v.gtin ?? null,
    reorderPoint: numeric(v.reorderPoint),
    orderQuantity: numeric(v.orderQuantity),
    leadTimeDays: v.leadTimeDays ?? null,
  };
}

async function checkUnique(tx: Tx, v: MaterialValues, exceptId: string | null): Promise<void> {
  const notSelf = exceptId ? ne(materials.id, exceptId) : undefined;
  const [sameCode] = await tx
    .select({ id: materials.id })
    .from(materials)
    .where(and(eq(materials.code, v.code), notSelf))
    .limit(1);
  if (sameCode) {
    throw conflict('DUPLICATE_CODE', `A material with the code "${v.code}" already exists; choose another code.`, [
      { field: 'code', message: 'is already used' },
    ]);
  }
  if (v.gtin) {
    const [sameGtin] = await tx
      .select({ code: materials.code })
      .from(materials)
      .where(and(eq(materials.gtin, v.gtin), notSelf))
      .limit(1);
    if (sameGtin) {
      throw conflict('DUPLICATE_GTIN', `The GTIN ${v.gtin} already belongs to ${sameGtin.code}; one GTIN identifies one material.`, [
        { field: 'gtin', message: 'is already used' },
      ]);
    }
  }
}

export async function createMaterial(actor: Actor, input: MaterialValues): Promise<Material> {
  requirePermission(actor, 'materials.edit');
  return db.transaction(async (tx) => {
    await checkUnique(tx, input, null);
    await checkPartner(tx, null, input.kind, input.partnerMaterialId ?? null, true);
    const [row] = await tx.insert(materials).values(columns(input)).returning();
    await relinkPartners(tx, actor, row, null, row.partnerMaterialId);
    const material = toMaterial(row);
    await recordAudit(tx, { actorId: actor.id, action: 'material.create', entityType: 'material', entityId: row.id, after: material });
    return material;
  });
}

/** The editable fields of a stored material, in input form, to merge an edit into. */
function editableFields(m: Material): Record<string, unknown> {
  const { id: _id, sdsAttachmentId: _sds, active: _active, createdAt: _c, updatedAt: _u, ...fields } = m;
  return fields;
}

export async function updateMaterial(actor: Actor, id: string, patch: MaterialPatch & { active?: boolean }): Promise<Material> {
  requirePermission(actor, 'materials.edit');
  return db.transaction(async (tx) => {
    const row = await findMaterial(tx, id, true);
    const before = toMaterial(row);
    const { active, ...changes } = patch;
    const defined = Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined));
    // The cross-field rules apply to the material as it will be after the edit.
    const parsed = materialInputSchema.safeParse({ ...editableFields(before), ...defined });
    if (!parsed.success) {
      const details = zodIssues(parsed.error);
      const first = details[0];
      throw badRequest(`Check the body: ${first.field ? `${first.field} ` : ''}${first.message}`, details);
    }
    const values = parsed.data;
    await checkUnique(tx, values, id);
    const partnerChanged = (values.partnerMaterialId ?? null) !== row.partnerMaterialId;
    await checkPartner(tx, id, values.kind, values.partnerMaterialId ?? null, partnerChanged);
    const [updated] = await tx
      .update(materials)
      .set({ ...columns(values), ...(active === undefined ? {} : { active }), updatedAt: new Date() })
      .where(eq(materials.id, id))
      .returning();
    await relinkPartners(tx, actor, updated, row.partnerMaterialId, updated.partnerMaterialId);
    const after = toMaterial(updated);
    await recordAudit(tx, { actorId: actor.id, action: 'material.update', entityType: 'material', entityId: id, before, after });
    return after;
  });
}

/** Retired materials stay in the records but cannot receive new lots. */
export async function retireMaterial(actor: Actor, id: string): Promise<Material> {
  requirePermission(actor, 'materials.edit');
  return db.transaction(async (tx) => {
    const row: MaterialRow = await findMaterial(tx, id, true);
    if (!row.active) return toMaterial(row);
    const [updated] = await tx.update(materials).set({ active: false, updatedAt: new Date() }).where(eq(materials.id, id)).returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'material.retire',
      entityType: 'material',
      entityId: id,
      before: { active: true },
      after: { active: false },
    });
    return toMaterial(updated);
  });
}
