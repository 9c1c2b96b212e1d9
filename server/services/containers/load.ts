import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials } from '../../db/schema';
import { notFound } from '../../errors';
import type { ContainerRow, LotRow, MaterialRow } from '../lots/present';

export interface ContainerContext {
  container: ContainerRow;
  lot: LotRow;
  material: MaterialRow;
}

/** A container with its lot and material; `lock` takes row locks on the container and its lot. */
export async function loadContainer(tx: DbOrTx, id: string, lock = false): Promise<ContainerContext> {
  const q = tx.select().from(containers).where(eq(containers.id, id));
  const [container] = lock ? await q.for('update') : await q;
  if (!container) throw notFound('The container');
  const lq = tx.select().from(lots).where(eq(lots.id, container.lotId));
  const [lot] = lock ? await lq.for('update') : await lq;
  const [material] = await tx.select().from(materials).where(eq(materials.id, lot.materialId));
  return { container, lot, material };
}

/** The same, found by its code (already normalized). */
export async function loadContainerByCode(tx: DbOrTx, code: string): Promise<ContainerContext | null> {
  const [row] = await tx.select({ id: containers.id }).from(containers).where(eq(containers.code, code));
  return row ? loadContainer(tx, row.id) : null;
}
