import { and, eq, inArray } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { containers, lots, materials } from '../../db/schema';
import { notFound } from '../../errors';
import { fefoOrder, isExpired } from '../../../shared/expiry';
import type { FefoEntry, FefoResult } from '../../../shared/schemas/containers';
import { containerExpiryOf, toContainer } from '../lots/present';

/**
 * Usable containers of a material, first-expiry-first-out (shared/expiry.ts fefoOrder): lot
 * released, container sealed or open, not past its effective expiry. The next one to use is an
 * open container that is still usable, if there is one (finish what is open first), else the
 * first in FEFO order.
 */
export async function materialFefo(tx: DbOrTx, materialId: string, now = new Date()): Promise<FefoResult> {
  const [material] = await tx.select().from(materials).where(eq(materials.id, materialId));
  if (!material) throw notFound('The material');
  const rows = await tx
    .select({ container: containers, lot: lots })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .where(and(eq(lots.materialId, materialId), eq(lots.status, 'released'), inArray(containers.status, ['sealed', 'open'])));
  const usable = rows
    .map(({ container, lot }) => ({ container, lot, expiry: containerExpiryOf(container, lot, material, now) }))
    .filter((r) => !isExpired(r.expiry, now) && Number(r.container.remaining) > 0)
    .map((r) => ({
      expiry: r.expiry.at,
      receivedAt: r.lot.receivedAt.toISOString(),
      seq: r.container.seq,
      entry: {
        ...toContainer(r.container, r.lot, material, now),
        supplierLot: r.lot.supplierLot,
        lotStatus: r.lot.status,
        lotReceivedAt: r.lot.receivedAt.toISOString(),
      } satisfies FefoEntry,
    }));
  const items = fefoOrder(usable).map((u) => u.entry);
  const open = items.find((c) => c.status === 'open');
  const next = open ?? items[0] ?? null;
  return { materialId, items, next, nextReason: next ? (open ? 'open_first' : 'earliest_expiry') : null };
}

export async function getMaterialFefo(materialId: string): Promise<FefoResult> {
  return materialFefo(db, materialId);
}
