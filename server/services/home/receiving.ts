import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import type { HomeReceiving } from '../../../shared/schemas/home';
import type { LotStatus } from '../../../shared/constants';
import { onHoldFigures } from './on-hold';

/** How many of today's lots the receiving section lists by name (the count covers them all). */
const LATEST_SHOWN = 5;

/** The receiving clerk's day: lots received on the dock in this plant day, and lots on hold. */
export async function receivingFigures(tx: DbOrTx, day: { start: Date; end: Date }): Promise<HomeReceiving> {
  const rows = (
    await tx.execute<{
      lot_id: string;
      supplier_lot: string;
      material_code: string;
      material_name: string;
      status: LotStatus;
      received_at: Date | string;
      containers: number;
      lots_total: number;
      containers_total: number;
    }>(sql`
      SELECT l.id AS lot_id, l.supplier_lot, m.code AS material_code, m.name AS material_name, l.status, l.received_at,
             c.n AS containers,
             count(*) OVER ()::int AS lots_total,
             (sum(c.n) OVER ())::int AS containers_total
      FROM lots l
      JOIN materials m ON m.id = l.material_id
      CROSS JOIN LATERAL (SELECT count(*)::int AS n FROM containers c WHERE c.lot_id = l.id) c
      WHERE l.received_at >= ${day.start} AND l.received_at < ${day.end}
      ORDER BY l.received_at DESC, l.id
      LIMIT ${LATEST_SHOWN}`)
  ).rows;
  return {
    receivedToday: {
      lots: rows[0]?.lots_total ?? 0,
      containers: rows[0]?.containers_total ?? 0,
      latest: rows.map((r) => ({
        lotId: r.lot_id,
        supplierLot: r.supplier_lot,
        materialCode: r.material_code,
        materialName: r.material_name,
        status: r.status,
        receivedAt: new Date(r.received_at).toISOString(),
        containers: r.containers,
      })),
    },
    onHold: await onHoldFigures(tx),
  };
}
