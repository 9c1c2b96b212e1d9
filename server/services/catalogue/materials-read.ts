import { and, asc, eq } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { materials } from '../../db/schema';
import { notFound } from '../../errors';
import type { Material, MaterialListQuery } from '../../../shared/schemas/materials';

export type MaterialRow = typeof materials.$inferSelect;

const num = (v: string | null) => (v === null ? null : Number(v));

/** A material row as the API shape (numeric columns as numbers). */
export function toMaterial(row: MaterialRow): Material {
  const hazards = row.hazards ?? { pictograms: [], statements: [] };
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    kind: row.kind,
    unit: row.unit,
    storageClass: row.storageClass,
    shelfLifeDays: row.shelfLifeDays,
    openLifeHours: row.openLifeHours,
    thawedLifeHours: row.thawedLifeHours,
    outOfStorageAllowanceHours: row.outOfStorageAllowanceHours,
    potLifeMinutes: row.potLifeMinutes,
    partnerMaterialId: row.partnerMaterialId,
    mixRatio: num(row.mixRatio),
    cure: row.cure ?? null,
    requiresInspection: row.requiresInspection,
    hazards: {
      ...(hazards.signalWord ? { signalWord: hazards.signalWord } : {}),
      pictograms: hazards.pictograms ?? [],
      statements: hazards.statements ?? [],
    },
    gtin: row.gtin,
    sdsAttachmentId: row.sdsAttachmentId,
    reorderPoint: num(row.reorderPoint),
    orderQuantity: num(row.orderQuantity),
    leadTimeDays: row.leadTimeDays,
    active: row.active,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The material row, or 404. `lock` takes a row lock for an update in the same transaction. */
export async function findMaterial(tx: DbOrTx, id: string, lock = false): Promise<MaterialRow> {
  const q = tx.select().from(materials).where(eq(materials.id, id));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('The material');
  return row;
}

export async function listMaterials(query: MaterialListQuery): Promise<{ items: Material[] }> {
  const where = and(
    query.active === undefined ? undefined : eq(materials.active, query.active),
    query.kind ? eq(materials.kind, query.kind) : undefined,
  );
  const rows = await db.select().from(materials).where(where).orderBy(asc(materials.code));
  return { items: rows.map(toMaterial) };
}

export async function getMaterial(id: string): Promise<Material> {
  return toMaterial(await findMaterial(db, id));
}
