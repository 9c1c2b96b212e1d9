/**
 * What the compliance watch looks for. Each check reads the database and returns findings:
 * one per subject that is in breach now. The watch turns new findings into alerts and resolves
 * alerts whose finding has gone.
 */
import { and, eq, gt, gte, inArray, isNotNull, isNull, lte, notInArray, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials, mixes, readings, stationLoads, stations, stepRuns, buildBatches, recipeSteps } from '../../db/schema';
import { readSetting } from '../settings';
import { auditChainBroken } from './audit-check';
import type { AlertSeverity, Role } from '../../../shared/constants';
import { lotStats } from '../trace/lot-stats';
import { containerExpiryOf, PLANT_ZONE } from '../lots/present';
import { lotExpirySql } from '../lots/expiry-sql';
import { cureOfRun, profilesForRuns } from '../cure/compute';
import { causeWords } from '../loading/usability';
import { plantDateTime } from '../../plant-time';
import { formatDate } from '../../../shared/plant-time';
import { pChartLimits } from '../../../shared/stats';
import { lotFailureDetail, lotFailureSentence } from '../../../shared/alert-words';
import { humidityOfRun } from '../cure/humidity';

export interface Finding {
  kind: string;
  severity: AlertSeverity;
  subjectType: 'mix' | 'step_run' | 'container' | 'lot' | 'material' | 'audit_entry' | 'station';
  subjectId: string;
  /** One sentence a person reads in one go. */
  message: string;
  /** The figures behind it, for a detail line (kept in the alert's data as `detail`). */
  detail?: string;
  audience: Role[];
  data?: Record<string, unknown>;
}

/** Alert texts are read later, so they carry the plant date and time: 2026-12-02 07:25. */
function when(d: Date): string {
  return plantDateTime(d);
}

/**
 * An expiry instant in words: a limit at plant midnight (a date printed on a label, usable
 * through that day) reads "at the end of 2026-12-15"; any other instant "at 2026-12-16 07:25".
 */
function expiryWords(at: Date): string {
  const local = DateTime.fromJSDate(at).setZone(PLANT_ZONE);
  if (local.hour === 0 && local.minute === 0 && local.second === 0) {
    return `at the end of ${formatDate(local.minus({ days: 1 }).toJSDate(), PLANT_ZONE)}`;
  }
  return `at ${when(at)}`;
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
    kind: 'pot_life_exceeded',
    severity: 'critical',
    subjectType: 'mix',
    subjectId: r.id,
    audience: ['assembler', 'quality'],
    message: `Mix ${r.code} at station ${r.station} passed its pot life at ${when(r.endsAt)} and is still loaded: unload it and dispose of it as its safety data sheet says.`,
    data: { mixCode: r.code, station: r.station, potLifeEndsAt: r.endsAt.toISOString() },
  }));
}

/** Steps started before the previous step's cure was complete (with or without a deviation), within the look-back setting. */
export async function shortCures(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const lookbackDays = await readSetting('shortCureLookbackDays', tx);
  const since = new Date(now.getTime() - lookbackDays * 86_400_000);
  const rows = await tx
    .select({
      id: stepRuns.id,
      batch: buildBatches.code,
      step: recipeSteps.name,
      startedAt: stepRuns.startedAt,
      deviationId: stepRuns.deviationId,
      // The run it had to wait for: the latest finished run of the step before, for the batch or the unit.
      prevRunId: sql<string | null>`(
        SELECT p.id FROM step_runs p JOIN recipe_steps ps ON ps.id = p.step_id
        WHERE p.batch_id = ${stepRuns.batchId} AND ps.model_id = ${recipeSteps.modelId} AND ps.seq < ${recipeSteps.seq}
          AND p.finished_at IS NOT NULL AND p.finished_at <= ${stepRuns.startedAt}
          AND (p.driver_id IS NULL OR p.driver_id = ${stepRuns.driverId})
        ORDER BY ps.seq DESC, (p.driver_id IS NULL), p.finished_at DESC LIMIT 1)`,
    })
    .from(stepRuns)
    .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .where(and(eq(stepRuns.shortCure, true), gte(stepRuns.startedAt, since)));
  const prevIds = rows.flatMap((r) => (r.prevRunId ? [r.prevRunId] : []));
  const prevRuns = prevIds.length
    ? await tx
        .select({
          id: stepRuns.id,
          finishedAt: stepRuns.finishedAt,
          cureCompleteAt: stepRuns.cureCompleteAt,
          area: stations.area,
          stationId: stepRuns.stationId,
        })
        .from(stepRuns)
        .innerJoin(stations, eq(stations.id, stepRuns.stationId))
        .where(inArray(stepRuns.id, prevIds))
    : [];
  const prevById = new Map(prevRuns.map((p) => [p.id, p]));
  const profiles = await profilesForRuns(tx, prevIds);
  const out: Finding[] = [];
  for (const r of rows) {
    // When the full cure was due as the gate saw it at the start (readings up to then), as the
    // station and the cure board showed it; else the time computed at the previous finish.
    const prev = r.prevRunId ? prevById.get(r.prevRunId) : undefined;
    const seen = prev?.finishedAt
      ? await cureOfRun(
          tx,
          { finishedAt: prev.finishedAt, area: prev.area, stationId: prev.stationId },
          profiles.get(prev.id) ?? [],
          r.startedAt,
        )
      : null;
    const cureAt = seen?.cureCompleteAt ? new Date(seen.cureCompleteAt) : (prev?.cureCompleteAt ?? null);
    const cure = cureAt
      ? `, before the previous step's adhesive was fully cured (full cure at ${when(cureAt)})`
      : ", before the previous step's adhesive was fully cured";
    out.push({
      kind: 'short_cure',
      severity: r.deviationId ? 'warning' : 'critical',
      subjectType: 'step_run',
      subjectId: r.id,
      audience: ['quality'],
      message: `Batch ${r.batch}: step "${r.step}" started at ${when(r.startedAt)}${cure}, ${r.deviationId ? 'under a recorded deviation' : 'without a deviation'}. Review the drivers of this batch.`,
      data: {
        batchCode: r.batch,
        step: r.step,
        deviationId: r.deviationId,
        startedAt: r.startedAt.toISOString(),
        cureCompleteAt: cureAt?.toISOString() ?? null,
      },
    });
  }
  return out;
}

/** Containers still in stock (or loaded) past their effective expiry. */
export async function expiredInStock(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const soon = new Date(now.getTime() + 86_400_000);
  const allowanceMinutes = sql`${materials.outOfStorageAllowanceHours} * 60`;
  const rows = await tx
    .select({
      c: containers,
      l: lots,
      m: materials,
      // Only the candidates are asked whether they are loaded (the open-loads index), not every open load read.
      loaded: sql<boolean>`EXISTS (SELECT 1 FROM ${stationLoads} sl WHERE sl.container_id = ${containers.id} AND sl.unloaded_at IS NULL)`,
    })
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
        // Out of cold storage: out now and the allowance left runs out by then, or already used up.
        sql`(${lotExpirySql(PLANT_ZONE)} <= ${soon}
          OR (${containers.openedAt} IS NOT NULL AND ${materials.openLifeHours} IS NOT NULL
              AND ${containers.openedAt} + make_interval(hours => ${materials.openLifeHours}) <= ${soon})
          OR (${containers.thawedAt} IS NOT NULL AND ${materials.thawedLifeHours} IS NOT NULL
              AND ${containers.thawedAt} + make_interval(hours => ${materials.thawedLifeHours}) <= ${soon})
          OR (${materials.outOfStorageAllowanceHours} IS NOT NULL AND ${materials.storageClass} <> 'ambient'
              AND ((${containers.outOfStorageSince} IS NOT NULL
                    AND ${containers.outOfStorageSince} + make_interval(mins => ${allowanceMinutes} - ${containers.outOfStorageMinutes}) <= ${soon})
                   OR (${containers.outOfStorageSince} IS NULL AND ${containers.outOfStorageMinutes} >= ${allowanceMinutes}))))`,
      ),
    );
  const out: Finding[] = [];
  for (const { c, l, m, loaded: isLoaded } of rows) {
    const exp = containerExpiryOf(c, l, m, now);
    if (!exp.at || new Date(exp.at) > now) continue;
    out.push({
      kind: 'expired_in_stock',
      severity: isLoaded ? 'critical' : 'warning',
      subjectType: 'container',
      subjectId: c.id,
      audience: isLoaded ? ['quality', 'receiving', 'assembler'] : ['quality', 'receiving'],
      message: `Container ${c.code} (${m.name}, lot ${l.supplierLot}) passed ${exp.cause ? causeWords(exp.cause) : 'its expiry'} ${expiryWords(new Date(exp.at))} and is ${isLoaded ? 'loaded at a station' : 'still in stock'}: take it out of use.`,
      data: { containerCode: c.code, lotId: l.id, materialId: m.id, cause: exp.cause, expiredAt: exp.at, loaded: isLoaded },
    });
  }
  return out;
}

/** Lots with stock whose lot-level expiry falls within the warning window. */
export async function expiringSoon(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const days = await readSetting('expiringSoonDays', tx);
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
      kind: 'expiring_soon',
      severity: 'info',
      subjectType: 'lot',
      subjectId: r.id,
      audience: ['purchasing', 'quality'],
      message: `Lot ${r.supplierLot} of ${r.material} is usable until ${expiryWords(at).replace(/^at /, '')}, within the next ${days} days: use it first or plan its disposal.`,
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
  // The same statistics as GET /api/lots/stats, over the lots received in the statistics window.
  const stats = await lotStats({ days: await readSetting('lotStatsWindowDays', tx), flaggedOnly: true }, tx);
  const out = new Map<string, Finding>();
  for (const f of stats.items) {
    if (!f.flagged || (f.status !== 'released' && f.status !== 'on_hold')) continue;
    const figures = {
      tested: f.tested,
      failures: f.failures,
      baseline: stats.baseline,
      pValue: f.pValue,
      qValue: f.qValue,
      ucl: pChartLimits(stats.baseline, f.tested).ucl,
      aboveUcl: f.aboveUcl,
    };
    out.set(f.lotId, {
      kind: 'quarantine_advised',
      severity: 'warning',
      subjectType: 'lot',
      subjectId: f.lotId,
      audience: ['quality'],
      message: `Lot ${f.supplierLot} of ${f.materialName} ${lotFailureSentence(figures)}. Consider quarantining it and tracing its drivers.`,
      detail: lotFailureDetail(figures),
      data: {
        inspected: f.tested,
        defectives: f.failures,
        pValue: f.pValue,
        qValue: f.qValue,
        ucl: figures.ucl,
        aboveUcl: f.aboveUcl,
        baseline: stats.baseline,
        reason: 'failure_rate',
      },
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
    const text = `its certificate of analysis expired on ${c.certExpires ? formatDate(c.certExpires, PLANT_ZONE) : 'an unknown date'}`;
    out.set(
      c.id,
      prev
        ? { ...prev, message: `${prev.message} Also, ${text}.` }
        : {
            kind: 'quarantine_advised',
            severity: 'warning',
            subjectType: 'lot',
            subjectId: c.id,
            audience: ['quality'],
            message: `The certificate of analysis of lot ${c.supplierLot} (${c.material}) ${text.replace(/^its certificate of analysis /, '')}: quarantine the lot until a current certificate is on file.`,
            data: { reason: 'certificate_expired', certificateExpiresOn: c.certExpires },
          },
    );
  }
  return [...out.values()];
}

/** Materials whose usable stock (released or on-hold lots) is below the reorder point. */
export async function belowReorderPoint(tx: DbOrTx): Promise<Finding[]> {
  const rows = await tx.execute<{
    id: string;
    code: string;
    name: string;
    unit: string;
    reorder_point: string;
    on_hand: string;
    order_quantity: string | null;
  }>(sql`
    SELECT m.id, m.code, m.name, m.unit, m.reorder_point, m.order_quantity,
           COALESCE(SUM(c.remaining) FILTER (WHERE l.status IN ('released', 'on_hold') AND c.status IN ('sealed', 'open')), 0) AS on_hand
    FROM materials m
    LEFT JOIN lots l ON l.material_id = m.id
    LEFT JOIN containers c ON c.lot_id = l.id
    WHERE m.active AND m.reorder_point IS NOT NULL
    GROUP BY m.id
    HAVING COALESCE(SUM(c.remaining) FILTER (WHERE l.status IN ('released', 'on_hold') AND c.status IN ('sealed', 'open')), 0) < m.reorder_point`);
  return rows.rows.map((r) => ({
    kind: 'below_reorder_point',
    severity: 'warning',
    subjectType: 'material',
    subjectId: r.id,
    audience: ['purchasing'],
    message: `${r.name} (${r.code}): ${Number(r.on_hand)} ${r.unit} on hand, below the reorder point of ${Number(r.reorder_point)} ${r.unit}${r.order_quantity ? `; the usual order is ${Number(r.order_quantity)} ${r.unit}` : ''}.`,
    data: { onHand: Number(r.on_hand), reorderPoint: Number(r.reorder_point) },
  }));
}

export const ALL_CHECKS = [
  potLifeExceeded,
  shortCures,
  expiredInStock,
  expiringSoon,
  quarantineAdvised,
  (tx: DbOrTx) => belowReorderPoint(tx),
  auditChainBroken,
  lampCheckDue,
  humidityOutOfWindow,
];

/**
 * A UV station (own cure environment) whose lamp has been measured at least once, or that ran a
 * UV step, and whose last radiometer reading is older than `lampCheckDays`: the dose of every
 * step there is computed from that reading, so it must be current.
 */
export async function lampCheckDue(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const days = await readSetting('lampCheckDays', tx);
  const limit = new Date(now.getTime() - days * 86_400_000);
  const rows = await tx
    .select({ id: stations.id, code: stations.code, name: stations.name, last: sql<Date | string>`max(${readings.at})` })
    .from(stations)
    .innerJoin(readings, and(eq(readings.stationId, stations.id), isNotNull(readings.irradianceMWcm2)))
    .where(and(eq(stations.active, true), eq(stations.cureEnvironment, 'own')))
    .groupBy(stations.id, stations.code, stations.name);
  return rows
    .map((r) => ({ ...r, last: new Date(r.last) }))
    .filter((r) => r.last < limit)
    .map((r) => ({
      kind: 'lamp_check_due',
      severity: 'warning' as const,
      subjectType: 'station' as const,
      subjectId: r.id,
      message: `The UV lamp of ${r.code} (${r.name}) was last measured with the radiometer at ${when(r.last)}, more than ${days} days ago; measure it before curing with it.`,
      audience: ['quality'] as Role[],
      data: { stationCode: r.code, lastReadingAt: r.last.toISOString(), lampCheckDays: days },
    }));
}

/**
 * A finished step whose adhesive has a humidity window (moisture-curing, from its data sheet)
 * and cured, between the finish and full cure (or now), while the area's relative humidity was
 * outside it. A compliance check, not a rate: no humidity formula is applied to the cure time.
 */
export async function humidityOutOfWindow(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const days = await readSetting('shortCureLookbackDays', tx);
  const since = new Date(now.getTime() - days * 86_400_000);
  const runs = await tx
    .select({
      id: stepRuns.id,
      finishedAt: stepRuns.finishedAt,
      cureCompleteAt: stepRuns.cureCompleteAt,
      area: stations.area,
      batch: buildBatches.code,
      step: recipeSteps.name,
    })
    .from(stepRuns)
    .innerJoin(stations, eq(stations.id, stepRuns.stationId))
    .innerJoin(buildBatches, eq(buildBatches.id, stepRuns.batchId))
    .innerJoin(recipeSteps, eq(recipeSteps.id, stepRuns.stepId))
    .where(and(isNotNull(stepRuns.finishedAt), gte(stepRuns.finishedAt, since)));
  if (runs.length === 0) return [];
  const profiles = await profilesForRuns(
    tx,
    runs.map((r) => r.id),
  );
  const out: Finding[] = [];
  for (const r of runs) {
    if (!r.finishedAt) continue;
    const h = await humidityOfRun(
      tx,
      { finishedAt: r.finishedAt, cureCompleteAt: r.cureCompleteAt, area: r.area },
      profiles.get(r.id) ?? [],
      now,
    );
    if (!h || h.outside.length === 0) continue;
    const first = h.outside[0];
    const range = `${h.rhMinPct ?? 0}–${h.rhMaxPct ?? 100} % RH`;
    out.push({
      kind: 'humidity_out_of_window',
      severity: 'warning',
      subjectType: 'step_run',
      subjectId: r.id,
      message: `Batch ${r.batch}, step "${r.step}": the adhesive cured while ${r.area} was at ${first.rhPct} % RH (from ${when(new Date(first.from))}), outside its data sheet range of ${range}.`,
      audience: ['quality'],
      data: {
        batchCode: r.batch,
        step: r.step,
        area: r.area,
        outside: h.outside,
        rhMinPct: h.rhMinPct,
        rhMaxPct: h.rhMaxPct,
      },
    });
  }
  return out;
}
