import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { mixes } from '../../db/schema';
import { notFound } from '../../errors';
import type { Mix, MixResult } from '../../../shared/schemas/mixes';
import { mixesByIds, type ContainerContext } from '../loading';

export function toMix(row: typeof mixes.$inferSelect, resin: ContainerContext, hardener: ContainerContext): Mix {
  return {
    id: row.id,
    code: row.code,
    stationId: row.stationId,
    resinContainerId: row.resinContainerId,
    resinContainerCode: resin.container.code,
    resinMaterialId: resin.material.id,
    hardenerContainerId: row.hardenerContainerId,
    hardenerContainerCode: hardener.container.code,
    hardenerMaterialId: hardener.material.id,
    resinQuantity: Number(row.resinQuantity),
    hardenerQuantity: Number(row.hardenerQuantity),
    remaining: Number(row.remaining),
    mixedAt: row.mixedAt.toISOString(),
    potLifeEndsAt: row.potLifeEndsAt.toISOString(),
    tempC: row.tempC === null ? null : Number(row.tempC),
    status: row.status,
    mixedBy: row.mixedBy,
  };
}

export async function getMix(id: string): Promise<MixResult> {
  const [row] = await db.select({ id: mixes.id }).from(mixes).where(eq(mixes.id, id));
  if (!row) throw notFound('The mix');
  const m = (await mixesByIds(db, [id])).get(id)!;
  return { mix: toMix(m.mix, m.resin, m.hardener) };
}
