/**
 * What the compliance watch looks for. Each check reads the database and returns findings:
 * one per subject that is in breach now. The watch turns new findings into alerts and resolves
 * alerts whose finding has gone.
 */
import { and, eq, gt, gte, inArray, isNull, lte, notInArray, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials, mixes, stationLoads, stations, stepRuns, buildBatches, recipeSteps, settings } from '../../db/schema';
import type { AlertSeverity, Role } from '../../../shared/constants';
import { lotStats } from '../trace/lot-stats';
import { containerExpiryOf, PLANT_ZONE } from '../lots/present';
import { lotExpirySql } from '../lots/expiry-sql';
import { causeWords } from '../loading/usability';

export interface Finding {
  kind: string;
  severity: AlertSeverity;
  subjectType: 'mix' | 'step_run' | 'container' | 'lot' | 'material';
  subjectId: string;
  message: string;
  audience: Role[];
  data?: Record<string, unknown>;
}

function when(d: Date, zone = PLANT_ZONE): string {
  return DateTime.fromJSDate(d).setZone(zone).toFormat('yyyy-MM-dd HH:mm');
}

async function setting<T>(tx: DbOrTx, key: string, fallback: T): Promise<T> {
  const [row] = await tx.select({ value: settings.value }).from(settings).where(eq(settings.key, key));
  return (row?.value as T | undefined) ?? fallback;
}

/** A mix past its pot life while still loaded at a station. */
export async function potLifeExceeded(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const rows = await tx
    .selectDistinctOn([mixes.id], { id: mixes.id, code: mixes.code, endsAt: mixes.potLifeEndsAt, station: stations.code })
    .from(stationLoads)
    .innerJoin(mixes, eq(mixes.id, stationLoads.mixId))
    .innerJoin(stations, eq(stations.id, stationLoads.stationId))
    .where(and(isNull(stationLoads.unloadedAt), eq(mixes.status, 'active'), lte(mixes.potLifeEndsAt, now)));
  return rows.map((r) => ({
    kind: 'pot_life_exceeded', severity: 'critical', subjectType: 'mix', subjectId: r.id, audience: ['assembler', 'quality'],
    message: `Mix ${r.code} at ${r.station} passed its pot life at ${when(r.endsAt)} and is still loaded: unload and discard it.`,
    data: { mixCode: r.code, station: r.station, potLifeEndsAt: r.endsAt.toISOString() },
  }));
}

/** Steps started before the previous step's cure was complete (with or without a deviation), last 30 days. */
export async function shortCures(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const since = new Date(now.getTime() - 30 * 86_400_000);
  const rows = await tx
    .select({ id: stepRuns.id, batch: buildBatches.code, step: recipeSteps.name, startedAt: stepRuns.startedAt, deviationId: stepRuns.deviationId })
    .from(stepRuns)
    .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .where(and(eq(stepRuns.shortCure, true), gte(stepRuns.startedAt, since)));
  return rows.map((r) => ({
    kind: 'short_cure', severity: r.deviationId ? 'warning' : 'critical', subjectType: 'step_run', subjectId: r.id, audience: ['quality'],
    message: `Batch ${r.batch}: "${r.step}" started at ${when(r.startedAt)} before the previous cure was complete${r.deviationId ? ' (under a recorded deviation)' : ' without a deviation'}. Review the drivers of this batch.`,
    data: { batchCode: r.batch, step: r.step, deviationId: r.deviationId },
  }));
}

/** Containers still in stock (or loaded) past their effective expiry. */
export async function expiredInStock(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const soon = new Date(now.getTime() + 86_400_000);
  const rows = await tx
    .select({ c: containers, l: lots, m: materials })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(
      and(
        inArray(containers.status, ['sealed', 'open']),
        notInArray(lots.status, ['rejected', 'used_up']),
        gt(containers.remaining, '0'),
        // Only containers that may have expired by now: a superset (a day's margin), so the exact
        // computation below (shared/expiry) still decides, on a handful of rows, not every one in stock.
        sql`(${lotExpirySql(PLANT_ZONE)} <= ${soon}
          OR (${containers.openedAt} IS NOT NULL AND ${materials.openLifeHours} IS NOT NULL
              AND ${containers.openedAt} + make_interval(hours => ${materials.openLifeHours}) <= ${soon})
          OR (${containers.thawedAt} IS NOT NULL AND ${materials.thawedLifeHours} IS NOT NULL
              AND ${containers.thawedAt} + make_interval(hours => ${materials.thawedLifeHours}) <= ${soon})
          OR (${materials.outOfStorageAllowanceHours} IS NOT NULL AND ${materials.storageClass} <> 'ambient'))`,
      ),
    );
  const loaded = new Set(
    (
      await tx.select({ id: stationLoads.containerId }).from(stationLoads).where(isNull(stationLoads.unloadedAt))
    ).map((r) => r.id),
  );
  const out: Finding[] = [];
  for (const { c, l, m } of rows) {
    const exp = containerExpiryOf(c, l, m, now);
    if (!exp.at || new Date(exp.at) > now) continue;
    const isLoaded = loaded.has(c.id);
    out.push({
      kind: 'expired_in_stock', severity: isLoaded ? 'critical' : 'warning', subjectType: 'container', subjectId: c.id,
      audience: isLoaded ? ['quality', 'receiving', 'assembler'] : ['quality', 'receiving'],
      message: `Container ${c.code} (${m.name}, lot ${l.supplierLot}) passed ${exp.cause ? causeWords(exp.cause) : 'its expiry'} at ${when(new Date(exp.at))} and is ${isLoaded ? 'loaded at a station' : 'still in stock'}: take it out of use.`,
      data: { containerCode: c.code, lotId: l.id, materialId: m.id, cause: exp.cause, expiredAt: exp.at, loaded: isLoaded },
    });
  }
  return out;
}

/** Lots with stock whose lot-level expiry falls within the warning window. */
export async function expiringSoon(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const days = await setting<number>(tx, 'expiringSoonDays', 14);
  const horizon = new Date(now.getTime() + days * 86_400_000);
  const expiry = lotExpirySql(PLANT_ZONE);
  const rows = await tx
    .select({ id: lots.id, supplierLot: lots.supplierLot, material: materials.name, expiresAt: expiry })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(
      and(
        inArray(lots.status, ['released', 'on_hold']),
        sql`${expiry} > ${now} AND ${expiry} <= ${horizon}`,
        sql`EXISTS (SELECT 1 FROM ${containers} WHERE ${containers.lotId} = ${lots.id} AND ${containers.status} IN ('sealed','open') AND ${containers.remaining} > 0)`,
      ),
    );
  return rows.map((r) => {
    const at = new Date(r.expiresAt as unknown as string);
    return {
      kind: 'expiring_soon', severity: 'info', subjectType: 'lot', subjectId: r.id, audience: ['purchasing', 'quality'],
      message: `Lot ${r.supplierLot} of ${r.material} expires at ${when(at)}, within ${days} days: use it first or plan its disposal.`,
      data: { expiresAt: at.toISOString(), windowDays: days },
    };
  });
}

/**
 * Lots whose final-test failure rate is statistically unlikely under the plant's baseline
 * (exact one-sided binomial test with Benjamini–Hochberg across lots, or above the p-chart
 * upper limit), and lots whose certificate of analysis has expired.
 */
export async function quarantineAdvised(tx: DbOrTx, now: Date): Promise<Finding[]> {
  // The same statistics as GET /api/lots/stats, over the lots received in the last year.
  const stats = await lotStats({ days: 365, flaggedOnly: true }, tx);
  const out = new Map<string, Finding>();
  for (const f of stats.items) {
    if (!f.flagged || (f.status !== 'released' && f.status !== 'on_hold')) continue;
    const rate = ((100 * f.failures) / f.tested).toFixed(1);
    out.set(f.lotId, {
      kind: 'quarantine_advised', severity: 'warning', subjectType: 'lot', subjectId: f.lotId, audience: ['quality'],
      message: `Lot ${f.supplierLot} of ${f.materialName}: ${f.failures} of ${f.tested} drivers built with it failed final test (${rate} % against a ${(stats.baseline * 100).toFixed(1)} % baseline; q = ${f.qValue.toPrecision(2)}${f.aboveUcl ? ', above the p-chart limit' : ''}). Consider quarantining it and tracing its drivers.`,
      data: { inspected: f.tested, defectives: f.failures, pValue: f.pValue, qValue: f.qValue, aboveUcl: f.aboveUcl, baseline: stats.baseline, reason: 'failure_rate' },
    });
  }
  const today = DateTime.fromJSDate(now).setZone(PLANT_ZONE).toISODate() as string;
  const certs = await tx
    .select({ id: lots.id, supplierLot: lots.supplierLot, material: materials.name, certExpires: lots.certificateExpiresOn })
    .from(lots)
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(and(inArray(lots.status, ['released', 'on_hold']), sql`${lots.certificateExpiresOn} < ${today}`));
  for (const c of certs) {
    const prev = out.get(c.id);
    const text = `the certificate of analysis of lot ${c.supplierLot} (${c.material}) expired on ${c.certExpires}`;
    out.set(c.id, prev
      ? { ...prev, message: `${prev.message} Also, ${text}.` }
      : {
          kind: 'quarantine_advised', severity: 'warning', subjectType: 'lot', subjectId: c.id, audience: ['quality'],
          message: `The certificate of analysis of lot ${c.supplierLot} (${c.material}) expired on ${c.certExpires}: quarantine the lot until a current certificate is on file.`,
          data: { reason: 'certificate_expired', certificateExpiresOn: c.certExpires },
        });
  }
  return [...out.values()];
}

/** Materials whose usable stock (released or on-hold lots) is below the reorder point. */
export async function belowReorderPoint(tx: DbOrTx): Promise<Finding[]> {
  const rows = await tx.execute<{ id: string; code: string; name: string; unit: string; reorder_point: string; on_hand: string; order_quantity: string | null }>(sql`
    SELECT m.id, m.code, m.name, m.unit, m.reorder_point, m.order_quantity,
           COALESCE(SUM(c.remaining) FILTER (WHERE l.status IN ('released', 'on_hold') AND c.status IN ('sealed', 'open')), 0) AS on_hand
    FROM materials m
    LEFT JOIN lots l ON l.material_id = m.id
    LEFT JOIN containers c ON c.lot_id = l.id
    WHERE m.active AND m.reorder_point IS NOT NULL
    GROUP BY m.id
    HAVING COALESCE(SUM(c.remaining) FILTER (WHERE l.status IN ('released', 'on_hold') AND c.status IN ('sealed', 'open')), 0) < m.reorder_point`);
  return rows.rows.map((r) => ({
    kind: 'below_reorder_point', severity: 'warning', subjectType: 'material', subjectId: r.id, audience: ['purchasing'],
    message: `${r.name} (${r.code}): ${Number(r.on_hand)} ${r.unit} on hand, below the reorder point of ${Number(r.reorder_point)} ${r.unit}${r.order_quantity ? `; the usual order is ${Number(r.order_quantity)} ${r.unit}` : ''}.`,
    data: { onHand: Number(r.on_hand), reorderPoint: Number(r.reorder_point) },
  }));
}

export const ALL_CHECKS = [potLifeExceeded, shortCures, expiredInStock, expiringSoon, quarantineAdvised, (tx: DbOrTx) => belowReorderPoint(tx)];

