import { asc, eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { attachments, containers, lots, materials, suppliers } from '../../db/schema';
import { notFound } from '../../errors';
import type { LotDetail } from '../../../shared/schemas/lots';
import { toMaterial } from '../catalogue/materials-read';
import { toSupplier } from '../catalogue/suppliers';
import { materialFefo } from '../containers/fefo';
import { toAttachment, toContainer, toLot } from './present';

/** GET /api/lots/:id: the lot with its material, supplier, containers, certificate and FEFO hint. */
export async function getLotDetail(id: string, now = new Date()): Promise<LotDetail> {
  const [row] = await db
    .select({ lot: lots, material: materials, supplier: suppliers })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .innerJoin(suppliers, eq(suppliers.id, lots.supplierId))
    .where(eq(lots.id, id));
  if (!row) throw notFound('The lot');
  const { lot, material, supplier } = row;
  const containerRows = await db.select().from(containers).where(eq(containers.lotId, id)).orderBy(asc(containers.seq));
  const [certificate] = lot.certificateId ? await db.select().from(attachments).where(eq(attachments.id, lot.certificateId)) : [];
  const fefo = await materialFefo(db, material.id, now);
  const presented = toLot(lot, material);
  return {
    lot: presented,
    material: toMaterial(material),
    supplier: toSupplier(supplier),
    containers: containerRows.map((c) => toContainer(c, lot, material, now)),
    effectiveExpiry: presented.effectiveExpiry,
    expiryCause: presented.expiryCause,
    certificate: certificate ? toAttachment(certificate) : null,
    fefoNext: fefo.next,
  };
}
