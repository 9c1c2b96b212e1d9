import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import type { OnHoldFigures } from '../../../shared/schemas/home';

/** Lots on hold awaiting incoming inspection: how many, and the one waiting longest. */
export async function onHoldFigures(tx: DbOrTx): Promise<OnHoldFigures> {
  const [row] = (
    await tx.execute<{ n: number; oldest_at: Date | string | null; oldest_id: string | null }>(sql`
      SELECT count(*)::int AS n,
             min(received_at) AS oldest_at,
             (array_agg(id ORDER BY received_at, id))[1] AS oldest_id
      FROM lots
      WHERE status = 'on_hold'`)
  ).rows;
  return {
    count: row?.n ?? 0,
    oldestReceivedAt: row?.oldest_at ? new Date(row.oldest_at).toISOString() : null,
    oldestLotId: row?.oldest_id ?? null,
  };
}
