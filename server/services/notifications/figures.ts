/**
 * The figures the daily digest reports. Purchasing's figures come through a pluggable source:
 * today they are read from the compliance watch's alerts and the lots (below-reorder-point and
 * expired-in-stock alerts, lots with stock expiring within the window); the stock computation
 * of the purchasing work (days of cover, run-out dates, FEFO predicted waste) can replace them
 * with `setPurchasingFiguresSource` without touching the digest or its template.
 */
import { and, desc, eq, gte, inArray, ne, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { alerts, buildBatches, containers, lots, materials, recipeSteps, stepRuns } from '../../db/schema';
import { formatDateTime, formatDuration } from '../../../shared/plant-time';
import { alertKindWords } from '../../../shared/notifications';
import { lotExpirySql } from '../lots/expiry-sql';
import { purchasingFiguresFromStock } from '../stock/digest-figures';
import { logger } from '../../logger';
import type { DigestItem, PurchasingFigures, QualityFigures } from '../mail/templates/digest';

export type PurchasingFiguresSource = (tx: DbOrTx, now: Date, zone: string) => Promise<PurchasingFigures>;

/** Alert kinds the purchasing part of the digest already reports (not listed again as alerts). */
export const PURCHASING_DIGEST_KINDS: ReadonlySet<string> = new Set(['below_reorder_point', 'expiring_soon', 'expired_in_stock']);

const EXPIRING_WINDOW_DAYS = 14;
const num = (v: unknown) => Number(v).toLocaleString('en-GB', { maximumFractionDigits: 2 });

/** Purchasing's figures from today's alerts and lots (until the stock figures are plugged in). */
export async function purchasingFiguresFromAlerts(tx: DbOrTx, now: Date, zone: string): Promise<PurchasingFigures> {
  const reorder = await tx
    .select({
      message: alerts.message,
      materialId: materials.id,
      name: materials.name,
      code: materials.code,
      leadTimeDays: materials.leadTimeDays,
    })
    .from(alerts)
    .innerJoin(materials, sql`${materials.id}::text = ${alerts.subjectId}`)
    .where(and(eq(alerts.kind, 'below_reorder_point'), ne(alerts.state, 'resolved')))
    .orderBy(materials.name);
  const runOuts: DigestItem[] = reorder.map((r) => ({
    title: `${r.name} (${r.code})`,
    detail: `${r.message.replace(`${r.name} (${r.code}): `, '')}${r.leadTimeDays !== null ? ` Lead time ${r.leadTimeDays} days: an order placed today arrives about then.` : ' No lead time is recorded.'}`,
    path: `/lots?materialId=${r.materialId}`,
  }));

  const expired = await tx
    .select({ message: alerts.message, data: alerts.data })
    .from(alerts)
    .where(and(eq(alerts.kind, 'expired_in_stock'), ne(alerts.state, 'resolved')))
    .orderBy(desc(alerts.raisedAt));
  const predictedWaste: DigestItem[] = expired.map((a) => {
    const data = a.data ?? {};
    const code = typeof data.containerCode === 'string' ? data.containerCode : 'A container';
    return { title: `Container ${code}`, detail: a.message, path: typeof data.lotId === 'string' ? `/lots/${data.lotId}` : null };
  });

  const expiry = lotExpirySql(zone);
  const horizon = new Date(now.getTime() + EXPIRING_WINDOW_DAYS * 86_400_000);
  const expiring = await tx
    .select({
      id: lots.id,
      supplierLot: lots.supplierLot,
      material: materials.name,
      unit: materials.unit,
      expiresAt: expiry,
      // Spelt out: in a select list drizzle leaves columns unqualified, and "id" would be the container's.
      remaining: sql<string>`(SELECT COALESCE(SUM(c.remaining), 0) FROM containers c WHERE c.lot_id = "lots"."id" AND c.status IN ('sealed','open'))`,
    })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(
      and(
        inArray(lots.status, ['released', 'on_hold']),
        sql`${expiry} > ${now} AND ${expiry} <= ${horizon}`,
        sql`EXISTS (SELECT 1 FROM ${containers} WHERE ${containers.lotId} = ${lots.id} AND ${containers.status} IN ('sealed','open') AND ${containers.remaining} > 0)`,
      ),
    )
    .orderBy(expiry);
  const expiringLots: DigestItem[] = expiring.map((l) => {
    const at = new Date(l.expiresAt as unknown as string);
    return {
      title: `Lot ${l.supplierLot} of ${l.material}`,
      detail: `${num(l.remaining)} ${l.unit} in stock; expires ${formatDateTime(at, zone)} (in ${formatDuration(at.getTime() - now.getTime())}).`,
      path: `/lots/${l.id}`,
    };
  });

  return {
    source: "from today's alerts and lots: materials below their reorder point, stock past its expiry, lots expiring soon",
    runOuts,
    predictedWaste,
    expiringLots,
    windowDays: EXPIRING_WINDOW_DAYS,
  };
}

// The stock figures of the purchasing work (FEFO simulation), as the Stock page shows them.
let purchasingSource: PurchasingFiguresSource = purchasingFiguresFromStock;

/** Plugs in another source of purchasing figures (null: back to the stock figures). */
export function setPurchasingFiguresSource(source: PurchasingFiguresSource | null): void {
  purchasingSource = source ?? purchasingFiguresFromStock;
}

/** Purchasing's figures; if the stock computation fails, the digest still goes with the alerts' figures. */
export async function purchasingFigures(tx: DbOrTx, now: Date, zone: string): Promise<PurchasingFigures> {
  try {
    return await purchasingSource(tx, now, zone);
  } catch (err) {
    if (purchasingSource === purchasingFiguresFromAlerts) throw err;
    logger.error({ err }, 'digest: the stock figures failed; using the alerts and lots instead');
    return purchasingFiguresFromAlerts(tx, now, zone);
  }
}

/** Quality's figures: open alerts by kind, lots waiting for inspection, short cures of the last day. */
export async function qualityFigures(tx: DbOrTx, now: Date, zone: string): Promise<QualityFigures> {
  const byKind = await tx
    .select({
      kind: alerts.kind,
      open: sql<number>`count(*) FILTER (WHERE ${alerts.state} = 'open')::int`,
      acknowledged: sql<number>`count(*) FILTER (WHERE ${alerts.state} = 'acknowledged')::int`,
      critical: sql<number>`count(*) FILTER (WHERE ${alerts.severity} = 'critical')::int`,
    })
    .from(alerts)
    .where(ne(alerts.state, 'resolved'))
    .groupBy(alerts.kind)
    .orderBy(alerts.kind);

  const onHold = await tx
    .select({ id: lots.id, supplierLot: lots.supplierLot, material: materials.name, receivedAt: lots.receivedAt })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(eq(lots.status, 'on_hold'))
    .orderBy(lots.receivedAt);

  const since = new Date(now.getTime() - 86_400_000);
  const shorts = await tx
    .select({
      batchId: buildBatches.id,
      batch: buildBatches.code,
      step: recipeSteps.name,
      startedAt: stepRuns.startedAt,
      deviationId: stepRuns.deviationId,
    })
    .from(stepRuns)
    .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .where(and(eq(stepRuns.shortCure, true), gte(stepRuns.startedAt, since)))
    .orderBy(stepRuns.startedAt);

  return {
    openAlertsByKind: byKind.map((k) => ({
      kind: alertKindWords(k.kind),
      open: k.open,
      acknowledged: k.acknowledged,
      critical: k.critical,
    })),
    lotsOnHold: onHold.map((l) => ({
      title: `Lot ${l.supplierLot} of ${l.material}`,
      detail: `received ${formatDateTime(l.receivedAt, zone)}, waiting ${formatDuration(now.getTime() - l.receivedAt.getTime())}.`,
      path: `/lots/${l.id}`,
    })),
    shortCures: shorts.map((s) => ({
      title: `Batch ${s.batch}`,
      detail: `"${s.step}" started ${formatDateTime(s.startedAt, zone)} before the previous cure was complete, ${s.deviationId ? 'under a recorded deviation' : 'without a deviation'}.`,
      path: `/batches/${s.batchId}`,
    })),
  };
}
