import { and, eq, isNull } from 'drizzle-orm';
import { db } from '../../db/client';
import { containers, mixes, stationLoads } from '../../db/schema';
import { AppError } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { auditUnloads } from './unload-audit';
import { findStation } from '../stations';
import type { UnloadInput, UnloadResult } from '../../../shared/schemas/station-loads';
import { scannedContainerCode } from './context';

/** POST /api/stations/:id/unload — takes a container or mix off the station (the load record stays). */
export async function unloadAtStation(actor: Actor, stationId: string, input: UnloadInput, now: Date = new Date()): Promise<UnloadResult> {
  requirePermission(actor, 'stations.load');
  return db.transaction(async (tx) => {
    const station = await findStation(tx, stationId);
    let target;
    if (input.loadId) target = eq(stationLoads.id, input.loadId);
    else if (input.containerCode) {
      const [c] = await tx
        .select({ id: containers.id })
        .from(containers)
        .where(eq(containers.code, scannedContainerCode(input.containerCode)));
      target = eq(stationLoads.containerId, c?.id ?? '00000000-0000-0000-0000-000000000000');
    } else {
      const [m] = await tx.select({ id: mixes.id }).from(mixes).where(eq(mixes.code, input.mixCode!));
      target = eq(stationLoads.mixId, m?.id ?? '00000000-0000-0000-0000-000000000000');
    }
    const rows = await tx
      .update(stationLoads)
      .set({ unloadedAt: now })
      .where(
        and(
          eq(stationLoads.stationId, station.id),
          isNull(stationLoads.unloadedAt),
          target,
          input.batchId ? eq(stationLoads.batchId, input.batchId) : undefined,
        ),
      )
      .returning();
    if (rows.length === 0) {
      const field = input.loadId ? 'loadId' : input.containerCode ? 'containerCode' : 'mixCode';
      throw new AppError('NOT_FOUND', `Nothing like that is loaded at station ${station.code}.`, 404, [
        { field, message: 'is not loaded here' },
      ]);
    }
    await auditUnloads(tx, actor.id, rows);
    return { unloaded: rows.map((r) => r.id) };
  });
}
