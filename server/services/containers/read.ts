import { db } from '../../db/client';
import type { ContainerScanResult } from '../../../shared/schemas/scans';
import { toMaterial } from '../catalogue/materials-read';
import { toContainer, toLot } from '../lots/present';
import { loadContainer } from './load';

/** GET /api/containers/:id: the container with its lot and material (the same shape a scan gives). */
export async function getContainer(id: string): Promise<Omit<ContainerScanResult, 'type'>> {
  const ctx = await loadContainer(db, id);
  return {
    container: toContainer(ctx.container, ctx.lot, ctx.material),
    lot: toLot(ctx.lot, ctx.material),
    material: toMaterial(ctx.material),
  };
}
