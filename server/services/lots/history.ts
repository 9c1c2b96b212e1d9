import { and, asc, eq, inArray, or, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { auditLog, containers, lots, users } from '../../db/schema';
import { notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { LOT_STATUSES, type LotStatus } from '../../../shared/constants';
import type { HistoryEntry, StatusChangeEntry } from '../../../shared/schemas/lots';

async function requireLot(id: string): Promise<void> {
  const [lot] = await db.select({ id: lots.id }).from(lots).where(eq(lots.id, id));
  if (!lot) throw notFound('The lot');
}

/**
 * GET /api/lots/:id/history: audit entries of the lot and of its containers, oldest first, with
 * who did it and the old and new values. Quality and administrators only (`lots.readHistory`).
 */
export async function getLotHistory(actor: Actor, id: string): Promise<{ items: HistoryEntry[] }> {
  requirePermission(actor, 'lots.readHistory');
  await requireLot(id);
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

function statusIn(record: unknown): LotStatus | null {
  const status = record && typeof record === 'object' ? (record as { status?: unknown }).status : undefined;
  return typeof status === 'string' && (LOT_STATUSES as readonly string[]).includes(status) ? (status as LotStatus) : null;
}

/**
 * GET /api/lots/:id/status-changes (anyone signed in): the status the lot was received with and
 * every change since, oldest first: status, when and the reason given. Who did it and the
 * record's other values stay in the full history (`lots.readHistory`).
 */
export async function getLotStatusChanges(id: string): Promise<{ items: StatusChangeEntry[] }> {
  await requireLot(id);
  const rows = await db
    .select({ at: auditLog.at, action: auditLog.action, before: auditLog.before, after: auditLog.after, reason: auditLog.reason })
    .from(auditLog)
    .where(and(eq(auditLog.entityType, 'lot'), eq(auditLog.entityId, id), inArray(auditLog.action, ['lot.receive', 'lot.status'])))
    .orderBy(asc(auditLog.at), asc(auditLog.id));
  const items: StatusChangeEntry[] = [];
  for (const r of rows) {
    const to = statusIn(r.after);
    if (!to) continue;
    items.push({ at: r.at.toISOString(), from: r.action === 'lot.receive' ? null : statusIn(r.before), to, reason: r.reason ?? null });
  }
  return { items };
}
