import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { containers, lots, materials, suppliers } from '../../db/schema';
import { conflict, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { toContainer, toLot, type MaterialRow } from '../lots/present';
import type { DuplicateLotDetails, ReceiveLotResult, ReceiveLotValues } from '../../../shared/schemas/lots';
import { newContainerCodes } from './codes';
import { plantDate } from '../../plant-time';

async function loadMaterial(tx: Tx, id: string): Promise<MaterialRow> {
  const [m] = await tx.select().from(materials).where(eq(materials.id, id));
  if (!m) throw fieldError('materialId', 'is not a material in the catalogue');
  if (!m.active)
    throw conflict('MATERIAL_RETIRED', `${m.code} ${m.name} is retired in the catalogue; new lots of it cannot be received.`, {
      materialId: id,
    });
  return m;
}

async function loadSupplier(tx: Tx, id: string) {
  const [s] = await tx.select().from(suppliers).where(eq(suppliers.id, id));
  if (!s) throw fieldError('supplierId', 'is not a supplier on file');
  if (!s.active)
    throw conflict('SUPPLIER_RETIRED', `${s.name} is retired; new lots from this supplier cannot be received.`, { supplierId: id });
  return s;
}

/** Lots of this material already received with the same supplier lot number (case and spaces ignored). */
async function findDuplicates(tx: Tx, materialId: string, supplierLot: string): Promise<DuplicateLotDetails | null> {
  const rows = await tx
    .select({
      id: lots.id,
      supplierLot: lots.supplierLot,
      supplierId: lots.supplierId,
      supplierName: suppliers.name,
      receivedAt: lots.receivedAt,
      status: lots.status,
      containerCount: sql<number>`(SELECT count(*)::int FROM ${containers} WHERE ${containers.lotId} = ${lots.id})`,
    })
    .from(lots)
    .innerJoin(suppliers, eq(suppliers.id, lots.supplierId))
    .where(and(eq(lots.materialId, materialId), eq(sql`upper(btrim(${lots.supplierLot}))`, supplierLot.trim().toUpperCase())))
    .orderBy(desc(lots.receivedAt), asc(lots.id));
  if (rows.length === 0) return null;
  const existingLots = rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString(), containerCount: Number(r.containerCount) }));
  return { existingLot: existingLots[0], existingLots };
}

/**
 * Records an incoming lot and its containers. New lots start on hold when the material
 * requires incoming inspection, else released. The same supplier lot of the same material a
 * second time is refused (409 DUPLICATE_LOT) unless the clerk confirms it.
 */
export async function receiveLot(actor: Actor, input: ReceiveLotValues): Promise<ReceiveLotResult> {
  requirePermission(actor, 'lots.receive');
  return db.transaction(async (tx) => {
    // One receipt per material at a time, so two clerks cannot both pass the duplicate check.
    await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`lot-receipt:${input.materialId}`}))`);
    const material = await loadMaterial(tx, input.materialId);
    await loadSupplier(tx, input.supplierId);
    if (input.gtin && material.gtin && input.gtin !== material.gtin) {
      throw conflict(
        'WRONG_MATERIAL',
        `The GTIN ${input.gtin} is not the GTIN of ${material.code} ${material.name} (${material.gtin}); check that the right material is chosen.`,
        [{ field: 'gtin', message: `does not match the material's GTIN ${material.gtin}` }],
      );
    }
    const duplicates = await findDuplicates(tx, material.id, input.supplierLot);
    if (duplicates && !input.confirmDuplicate) {
      const when = plantDate(duplicates.existingLot.receivedAt);
      throw conflict(
        'DUPLICATE_LOT',
        `Supplier lot ${input.supplierLot} of ${material.code} was already received on ${when}. If this really is another delivery of the same lot, confirm to receive it again.`,
        duplicates,
      );
    }
    const status = material.requiresInspection ? 'on_hold' : 'released';
    const [lot] = await tx
      .insert(lots)
      .values({
        materialId: material.id,
        supplierId: input.supplierId,
        supplierLot: input.supplierLot,
        gtin: input.gtin ?? material.gtin ?? null,
        status,
        receivedAt: input.receivedAt ? new Date(input.receivedAt) : new Date(),
        manufacturedOn: input.manufacturedOn ?? null,
        expiresOn: input.expiresOn ?? null,
        notes: input.notes,
        receivedBy: actor.id,
      })
      .returning();
    const codes = await newContainerCodes(tx, input.containers);
    const quantity = String(input.quantityPerContainer);
    const rows = await tx
      .insert(containers)
      .values(codes.map((code, i) => ({ code, lotId: lot.id, seq: i + 1, quantity, remaining: quantity, location: input.location })))
      .returning();
    rows.sort((a, b) => a.seq - b.seq);
    const result = { lot: toLot(lot, material), containers: rows.map((c) => toContainer(c, lot, material)) };
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'lot.receive',
      entityType: 'lot',
      entityId: lot.id,
      after: {
        ...result.lot,
        containers: rows.map((c) => ({ id: c.id, code: c.code, seq: c.seq, quantity: Number(c.quantity), location: c.location })),
        ...(duplicates ? { duplicateConfirmed: true, duplicateOf: duplicates.existingLots.map((l) => l.id) } : {}),
      },
    });
    return result;
  });
}
