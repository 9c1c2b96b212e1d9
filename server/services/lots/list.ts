import { and, asc, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { containers, lots, materials, suppliers } from '../../db/schema';
import type { LotListItem, LotListQuery, LotPage } from '../../../shared/schemas/lots';
import { PLANT_ZONE, toLot } from './present';
import { lotExpirySql } from './expiry-sql';

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

function filters(query: LotListQuery, expiry: SQL, now: Date): SQL | undefined {
  const conditions: (SQL | undefined)[] = [
    query.status ? inArray(lots.status, query.status) : undefined,
    query.materialId ? eq(lots.materialId, query.materialId) : undefined,
    query.supplierId ? eq(lots.supplierId, query.supplierId) : undefined,
  ];
  if (query.expiringWithinDays !== undefined) {
    const until = new Date(now.getTime() + query.expiringWithinDays * 86_400_000).toISOString();
    conditions.push(sql`${expiry} <= ${until}::timestamptz`);
  }
  if (query.q) {
    const pattern = likePattern(query.q);
    conditions.push(
      or(
        ilike(lots.supplierLot, pattern),
        sql`EXISTS (SELECT 1 FROM ${containers} WHERE ${containers.lotId} = ${lots.id} AND ${containers.code} ILIKE ${pattern})`,
      ),
    );
  }
  return and(...conditions);
}

function ordering(query: LotListQuery, expiry: SQL): SQL[] {
  const dir = query.dir === 'asc' ? asc : desc;
  const primary: SQL[] = {
    receivedAt: [dir(lots.receivedAt)],
    // No expiry counts as "latest": last when ascending, first when descending.
    effectiveExpiry: [query.dir === 'asc' ? sql`${expiry} ASC NULLS LAST` : sql`${expiry} DESC NULLS FIRST`],
    supplierLot: [dir(lots.supplierLot)],
    status: [dir(lots.status)],
    material: [dir(materials.name), dir(materials.code)],
  }[query.sort];
  return [...primary, desc(lots.receivedAt), asc(lots.id)];
}

/** GET /api/lots: one page of lots with their material, supplier and container totals. */
export async function listLots(query: LotListQuery, now = new Date(), tx: DbOrTx = db): Promise<LotPage> {
  const expiry = lotExpirySql(PLANT_ZONE);
  const where = filters(query, expiry, now);
  const active = sql`${containers.status} IN ('sealed', 'open')`;
  const rows = await tx
    .select({
      lot: lots,
      material: materials,
      supplierName: suppliers.name,
      containerCount: sql<number>`(SELECT count(*)::int FROM ${containers} WHERE ${containers.lotId} = ${lots.id})`,
      activeContainerCount: sql<number>`(SELECT count(*)::int FROM ${containers} WHERE ${containers.lotId} = ${lots.id} AND ${active})`,
      remaining: sql<string>`(SELECT coalesce(sum(${containers.remaining}), 0) FROM ${containers} WHERE ${containers.lotId} = ${lots.id} AND ${active})`,
    })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .innerJoin(suppliers, eq(suppliers.id, lots.supplierId))
    .where(where)
    .orderBy(...ordering(query, expiry))
    .limit(query.limit)
    .offset(query.offset);
  const [{ total }] = await tx
    .select({ total: sql<number>`count(*)::int` })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .innerJoin(suppliers, eq(suppliers.id, lots.supplierId))
    .where(where);
  const items: LotListItem[] = rows.map((r) => ({
    ...toLot(r.lot, r.material),
    materialCode: r.material.code,
    materialName: r.material.name,
    materialUnit: r.material.unit,
    supplierName: r.supplierName,
    containerCount: Number(r.containerCount),
    activeContainerCount: Number(r.activeContainerCount),
    remaining: Number(r.remaining),
  }));
  return { items, total: Number(total) };
}

/** The SQL lot expiry for some lots (to check it against shared/expiry.ts). */
export async function sqlLotExpiries(lotIds: string[], zone = PLANT_ZONE): Promise<Map<string, string | null>> {
  if (lotIds.length === 0) return new Map();
  const rows = await db
    .select({ id: lots.id, at: lotExpirySql(zone) })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(inArray(lots.id, lotIds));
  return new Map(rows.map((r) => [r.id, r.at ? new Date(r.at).toISOString() : null]));
}
