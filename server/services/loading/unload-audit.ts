import type { DbOrTx } from '../../db/client';
import type { stationLoads } from '../../db/schema';
import { recordAudit } from '../audit';

/** Audits station loads just taken off (one entry each, old and new unload time). */
export async function auditUnloads(
  tx: DbOrTx,
  actorId: string,
  rows: (typeof stationLoads.$inferSelect)[],
  reason?: string,
): Promise<void> {
  for (const r of rows) {
    await recordAudit(tx, {
      actorId,
      action: 'station.unload',
      entityType: 'station_load',
      entityId: r.id,
      before: { unloadedAt: null },
      after: { unloadedAt: r.unloadedAt?.toISOString() ?? null },
      reason: reason ?? null,
    });
  }
}
