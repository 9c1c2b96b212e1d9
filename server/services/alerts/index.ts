import { and, arrayOverlaps, count, desc, eq, inArray, ne, type SQL } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { alerts, users } from '../../db/schema';
import { conflict, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { can } from '../../../shared/permissions';
import { recordAudit } from '../audit';
import type { Alert, AlertListQuery } from '../../../shared/schemas/alerts';
import { queueAlertResolvedMails } from '../notifications/alert-mail';
import { mailQueued } from '../mail/worker';

type AlertRow = typeof alerts.$inferSelect;

/** Names of the people who acknowledged or resolved these alerts, by user id. */
export async function namesOf(tx: DbOrTx, rows: AlertRow[]): Promise<Map<string, string>> {
  const ids = [...new Set(rows.flatMap((r) => [r.acknowledgedBy, r.resolvedBy]).filter((id): id is string => !!id))];
  if (!ids.length) return new Map();
  const found = await tx.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids));
  return new Map(found.map((u) => [u.id, u.name]));
}

export function toAlert(r: AlertRow, names: ReadonlyMap<string, string> = new Map()): Alert {
  const detail = r.data && typeof r.data.detail === 'string' ? r.data.detail : null;
  return {
    id: r.id,
    kind: r.kind,
    severity: r.severity,
    state: r.state,
    subjectType: r.subjectType,
    subjectId: r.subjectId,
    message: r.message,
    detail,
    audience: r.audience,
    data: r.data ?? null,
    raisedAt: r.raisedAt.toISOString(),
    acknowledgedAt: r.acknowledgedAt?.toISOString() ?? null,
    acknowledgedBy: r.acknowledgedBy,
    acknowledgedByName: r.acknowledgedBy ? (names.get(r.acknowledgedBy) ?? null) : null,
    resolvedAt: r.resolvedAt?.toISOString() ?? null,
    resolvedBy: r.resolvedBy,
    resolvedByName: r.resolvedBy ? (names.get(r.resolvedBy) ?? null) : null,
    resolution: r.resolution,
  };
}

/** The list's filters and the actor's reach (their roles' alerts; all for an administrator), shared with the CSV. */
export function alertsWhere(actor: Actor, query: Pick<AlertListQuery, 'state' | 'kind' | 'severity'>): SQL | undefined {
  const filters = [];
  if (query.state === 'live') filters.push(ne(alerts.state, 'resolved'));
  else if (query.state) filters.push(eq(alerts.state, query.state));
  if (query.kind) filters.push(eq(alerts.kind, query.kind));
  if (query.severity) filters.push(eq(alerts.severity, query.severity));
  if (!can(actor.roles, 'alerts.readAll')) filters.push(arrayOverlaps(alerts.audience, actor.roles));
  return filters.length ? and(...filters) : undefined;
}

/** Newest first; the id breaks ties. */
export const ALERTS_ORDER = [desc(alerts.raisedAt), alerts.id];

/** Alerts for the roles the actor holds (an administrator sees all), newest first. */
export async function listAlerts(
  actor: Actor,
  query: Pick<AlertListQuery, 'state' | 'kind' | 'severity' | 'limit' | 'offset'>,
  tx: DbOrTx = db,
): Promise<{ items: Alert[]; total: number }> {
  const where = alertsWhere(actor, query);
  const [rows, [{ n }]] = await Promise.all([
    tx
      .select()
      .from(alerts)
      .where(where)
      .orderBy(...ALERTS_ORDER)
      .limit(query.limit)
      .offset(query.offset),
    tx.select({ n: count() }).from(alerts).where(where),
  ]);
  const names = await namesOf(tx, rows);
  return { items: rows.map((r) => toAlert(r, names)), total: n };
}

async function changeState(actor: Actor, id: string, to: 'acknowledged' | 'resolved', resolution?: string): Promise<Alert> {
  const alert = await db.transaction(async (tx) => {
    const [row] = await tx.select().from(alerts).where(eq(alerts.id, id)).for('update');
    if (!row) throw notFound('That alert');
    if (!can(actor.roles, 'alerts.readAll') && !row.audience.some((r) => actor.roles.includes(r))) throw notFound('That alert');
    if (row.state === 'resolved') throw conflict('ALERT_RESOLVED', 'This alert is already resolved.');
    if (to === 'acknowledged' && row.state === 'acknowledged') throw conflict('ALERT_ACKNOWLEDGED', 'This alert is already acknowledged.');
    const now = new Date();
    const change =
      to === 'acknowledged'
        ? { state: to, acknowledgedAt: now, acknowledgedBy: actor.id }
        : { state: to, resolvedAt: now, resolvedBy: actor.id, resolution: resolution ?? null };
    const [updated] = await tx.update(alerts).set(change).where(eq(alerts.id, id)).returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: `alert.${to === 'acknowledged' ? 'acknowledge' : 'resolve'}`,
      entityType: 'alert',
      entityId: id,
      before: { state: row.state },
      after: { state: to },
      reason: resolution ?? null,
    });
    // Resolving e-mails only those who asked to hear of it (their notification settings).
    if (to === 'resolved') await queueAlertResolvedMails(tx, row, resolution ?? '', now, actor.name);
    return toAlert(updated, await namesOf(tx, [updated]));
  });
  if (to === 'resolved') mailQueued();
  return alert;
}

export function acknowledgeAlert(actor: Actor, id: string): Promise<Alert> {
  requirePermission(actor, 'alerts.acknowledge');
  return changeState(actor, id, 'acknowledged');
}

export function resolveAlert(actor: Actor, id: string, resolution: string): Promise<Alert> {
  requirePermission(actor, 'alerts.resolve');
  return changeState(actor, id, 'resolved', resolution);
}
export { exportAlertsCsv } from './export';
