import { and, asc, eq, inArray, or, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { auditLog, containers, lots, users } from '../../db/schema';
import { notFound } from '../../errors';
import type { HistoryEntry } from '../../../shared/schemas/lots';

/** GET /api/lots/:id/history: audit entries of the lot and of its containers, oldest first. */
export async function getLotHistory(id: string): Promise<{ items: HistoryEntry[] }> {
  const [lot] = await db.select({ id: lots.id }).from(lots).where(eq(lots.id, id));
  if (!lot) throw notFound('The lot');
  const containerIds = sql`(SELECT ${containers.id}::text FROM ${containers} WHERE ${containers.lotId} = ${id})`;
  const rows = await db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      actorId: auditLog.actorId,
      actorName: users.name,
      action: auditLog.action,
      entityType: auditLog.entityType,
      entityId: auditLog.entityId,
      containerCode: containers.code,
      before: auditLog.before,
      after: auditLog.after,
      reason: auditLog.reason,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .leftJoin(containers, and(eq(auditLog.entityType, 'container'), eq(sql`${containers.id}::text`, auditLog.entityId)))
    .where(
      or(
        and(eq(auditLog.entityType, 'lot'), eq(auditLog.entityId, id)),
        and(eq(auditLog.entityType, 'container'), inArray(auditLog.entityId, containerIds)),
      ),
    )
    .orderBy(asc(auditLog.at), asc(auditLog.id));
  return {
    items: rows.map((r) => ({
      ...r,
      at: r.at.toISOString(),
      actorName: r.actorName ?? null,
      containerCode: r.containerCode ?? null,
    })),
  };
}
