import { and, asc, eq, inArray, or, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { attachments, auditLog, buildBatches, containers, lots, materials, mixes, stations, suppliers, users } from '../../db/schema';
import { notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { LOT_STATUSES, type LotStatus } from '../../../shared/constants';
import type { HistoryEntry, StatusChangeEntry } from '../../../shared/schemas/lots';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Which table names an id field's value, and by what (a code, a file name, a name). */
const NAMED_BY = {
  certificateId: { table: attachments, id: attachments.id, name: attachments.filename },
  stationId: { table: stations, id: stations.id, name: stations.code },
  batchId: { table: buildBatches, id: buildBatches.id, name: buildBatches.code },
  mixId: { table: mixes, id: mixes.id, name: mixes.code },
  containerId: { table: containers, id: containers.id, name: containers.code },
  lotId: { table: lots, id: lots.id, name: lots.supplierLot },
  supplierId: { table: suppliers, id: suppliers.id, name: suppliers.name },
  materialId: { table: materials, id: materials.id, name: materials.name },
} as const;

type NamedField = keyof typeof NAMED_BY;

/** The ids found under the known id fields of the audit values, per field. */
function idsByField(values: unknown[]): Map<NamedField, Set<string>> {
  const out = new Map<NamedField, Set<string>>();
  for (const v of values) {
    if (!v || typeof v !== 'object' || Array.isArray(v)) continue;
    for (const [key, value] of Object.entries(v as Record<string, unknown>)) {
      if (!(key in NAMED_BY) || typeof value !== 'string' || !UUID.test(value)) continue;
      const set = out.get(key as NamedField) ?? new Set<string>();
      set.add(value);
      out.set(key as NamedField, set);
    }
  }
  return out;
}

/** id → name for every id the history mentions (one query per kind of thing). */
async function namesOfIds(values: unknown[]): Promise<Map<string, string>> {
  const names = new Map<string, string>();
  for (const [field, ids] of idsByField(values)) {
    const { table, id, name } = NAMED_BY[field];
    const rows = await db
      .select({ id, name })
      .from(table)
      .where(inArray(id, [...ids]));
    for (const r of rows) names.set(r.id, r.name);
  }
  return names;
}

function namesIn(values: unknown[], names: Map<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const ids of idsByField(values).values())
    for (const id of ids) {
      const name = names.get(id);
      if (name) out[id] = name;
    }
  return out;
}

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
  const names = await namesOfIds(rows.flatMap((r) => [r.before, r.after]));
  return {
    items: rows.map((r) => ({
      ...r,
      at: r.at.toISOString(),
      actorName: r.actorName ?? null,
      containerCode: r.containerCode ?? null,
      names: namesIn([r.before, r.after], names),
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
