/**
 * One material's stock picture: on hand by lot status, daily use, the FEFO simulation of what
 * is usable (shared/stock.ts), days of cover, predicted waste and reorder advice (shared/reorder.ts).
 */
import { DateTime } from 'luxon';
import { containerExpiry, isExpired, lotExpiry, type ExpiryResult } from '../../../shared/expiry';
import { formatDate } from '../../../shared/plant-time';
import { chooseDailyUse, median, packWarningText, qty, reorderAdvice } from '../../../shared/reorder';
import { DAY_MS, roundQty, simulateFefo, type SimContainerInput, type SimResult } from '../../../shared/stock';
import type { StockAdvice, StockItem } from '../../../shared/schemas/stock';
import { containerExpiryOf, expiryLotOf, expiryMaterialOf, type MaterialRow } from '../lots/present';
import type { StockData, StockRow } from './load';
import type { StockSettings } from './settings';

export interface CountedContainer {
  row: StockRow;
  expiryNow: ExpiryResult;
  input: SimContainerInput;
}

export interface MaterialModel {
  material: MaterialRow;
  item: StockItem;
  sim: SimResult;
  /** In the order given to the simulation (sim.containers[i] belongs to counted[i]). */
  counted: CountedContainer[];
  notCounted: { row: StockRow; expiryNow: ExpiryResult; reason: string }[];
}

/** Life after opening the simulation applies: a frozen cartridge's thawed life starts when it is taken into use. */
function lifeOnceOpened(m: MaterialRow, row: StockRow): number | null {
  const lives = [m.openLifeHours];
  if (m.storageClass === 'frozen' && !row.container.thawedAt) lives.push(m.thawedLifeHours);
  const known = lives.filter((h): h is number => h !== null && h > 0);
  return known.length ? Math.min(...known) : null;
}

function lifeAtArrival(m: MaterialRow, data: StockData, zone: string) {
  const receipts = data.receipts.get(m.id) ?? [];
  const lives: number[] = [];
  const ages: number[] = [];
  for (const l of receipts) {
    const exp = lotExpiry(expiryMaterialOf(m), expiryLotOf(l), zone).at;
    if (exp) lives.push((Date.parse(exp) - l.receivedAt.getTime()) / DAY_MS);
    if (l.manufacturedOn) {
      const made = DateTime.fromISO(l.manufacturedOn, { zone }).startOf('day').toMillis();
      ages.push((l.receivedAt.getTime() - made) / DAY_MS);
    }
  }
  const life = median(lives);
  const round1 = (n: number | null) => (n === null ? null : Math.round(n * 10) / 10);
  if (life !== null) {
    return {
      lifeAtArrivalDays: round1(life),
      lifeAtArrivalSource: 'receipts' as const,
      ageAtReceiptDays: round1(median(ages)),
      receiptsCounted: lives.length,
    };
  }
  return {
    lifeAtArrivalDays: m.shelfLifeDays,
    lifeAtArrivalSource: m.shelfLifeDays === null ? null : ('nominal' as const),
    ageAtReceiptDays: round1(median(ages)),
    receiptsCounted: 0,
  };
}

function adviceText(
  a: ReturnType<typeof reorderAdvice>,
  m: MaterialRow,
  ctx: { runsOutOn: string | null; orderByDate: string | null; usable: number; settings: StockSettings; lifeDays: number | null },
): string {
  const u = m.unit;
  const how =
    a.quantity === null
      ? ''
      : a.orderQuantities !== null && m.orderQuantity !== null
        ? ` Order ${a.orderQuantities} × ${qty(Number(m.orderQuantity))} ${u} (${qty(a.quantity)} ${u}).`
        : ` Order about ${qty(a.quantity)} ${u}.`;
  const limit =
    a.limitedByShelfLife && ctx.lifeDays !== null
      ? ` No more: only that much is used in the ${qty(ctx.lifeDays)} days of shelf life left at arrival.`
      : '';
  const lead = m.leadTimeDays ?? 0;
  switch (a.action) {
    case 'order_now':
      if (a.runOutInsideLeadTime) return `Order now: runs out ${ctx.runsOutOn}, inside the ${lead}-day lead time.${how}${limit}`;
      if (a.belowReorderPoint)
        return `Order now: ${qty(ctx.usable)} ${u} usable, below the reorder point of ${qty(Number(m.reorderPoint))} ${u}.${how}${limit}`;
      return `Order now: runs out ${ctx.runsOutOn}; ${lead} days lead time and ${ctx.settings.safetyDays} days margin leave no later date.${how}${limit}`;
    case 'order_soon':
      if (a.orderBy === null) return `Below the reorder point of ${qty(Number(m.reorderPoint))} ${u}, though not used lately.${how}`;
      return `Order by ${ctx.orderByDate}: runs out ${ctx.runsOutOn}.${how}${limit}`;
    case 'enough':
      return ctx.runsOutOn
        ? `Enough stock: order by ${ctx.orderByDate} (runs out ${ctx.runsOutOn}).`
        : `Enough stock for more than ${ctx.settings.horizonDays} days at the current use.`;
    case 'not_used':
      return `Not used in the last ${ctx.settings.useWindowDays} days and no open batch needs it.`;
  }
}

export function buildMaterialModel(m: MaterialRow, data: StockData, settings: StockSettings, now: Date, zone: string): MaterialModel {
  const rows = [...(data.stock.get(m.id) ?? [])].sort(
    (a, b) => a.lot.receivedAt.getTime() - b.lot.receivedAt.getTime() || a.container.seq - b.container.seq,
  );
  const onHand = { released: 0, onHold: 0, quarantined: 0 };
  const counted: CountedContainer[] = [];
  const notCounted: MaterialModel['notCounted'] = [];
  let expiredOnHand = 0;
  for (const row of rows) {
    const remaining = Number(row.container.remaining);
    if (row.lot.status === 'released') onHand.released += remaining;
    else if (row.lot.status === 'on_hold') onHand.onHold += remaining;
    else if (row.lot.status === 'quarantined') onHand.quarantined += remaining;
    const expiryNow = containerExpiryOf(row.container, row.lot, m, now, zone);
    if (row.lot.status === 'quarantined') {
      notCounted.push({ row, expiryNow, reason: 'Lot quarantined: not counted until quality releases it.' });
      continue;
    }
    if (isExpired(expiryNow, now)) {
      expiredOnHand += remaining;
      notCounted.push({ row, expiryNow, reason: 'Past its expiry: to be scrapped.' });
      continue;
    }
    // Shelf expiry before any opening; the simulation adds the after-opening life itself.
    const shelf = containerExpiry(
      expiryMaterialOf(m),
      expiryLotOf(row.lot),
      {
        openedAt: null,
        thawedAt: row.container.thawedAt?.toISOString() ?? null,
        outOfStorageMinutes: row.container.outOfStorageMinutes,
        outOfStorageSince: row.container.outOfStorageSince?.toISOString() ?? null,
      },
      zone,
      now,
    );
    counted.push({
      row,
      expiryNow,
      input: {
        quantity: remaining,
        expiresAt: shelf.at,
        openLifeHours: lifeOnceOpened(m, row),
        openedAt: row.container.openedAt && row.container.openedAt <= now ? row.container.openedAt.toISOString() : null,
      },
    });
  }

  const use = chooseDailyUse({
    historyQuantity: data.history.get(m.id) ?? 0,
    windowDays: settings.useWindowDays,
    planQuantity: data.plan.get(m.id) ?? 0,
    planDays: settings.planDays,
  });
  const sim = simulateFefo({
    start: now.toISOString(),
    dailyUse: use.dailyUse,
    containers: counted.map((c) => c.input),
    horizonDays: settings.horizonDays,
  });
  const usableOnHand = roundQty(counted.reduce((s, c) => s + c.input.quantity, 0));
  const daysOfCover = sim.runsOutAt === null ? null : Math.round(((Date.parse(sim.runsOutAt) - now.getTime()) / DAY_MS) * 10) / 10;
  const life = lifeAtArrival(m, data, zone);
  const packSize = data.packSize.get(m.id) ?? null;
  const openLife = m.openLifeHours ?? (m.storageClass === 'frozen' ? m.thawedLifeHours : null);
  const a = reorderAdvice({
    now: now.toISOString(),
    dailyUse: use.dailyUse,
    runsOutAt: sim.runsOutAt,
    usableOnHand,
    reorderPoint: m.reorderPoint === null ? null : Number(m.reorderPoint),
    orderQuantity: m.orderQuantity === null ? null : Number(m.orderQuantity),
    leadTimeDays: m.leadTimeDays,
    safetyDays: settings.safetyDays,
    packSize,
    openLifeHours: openLife,
    lifeAtArrivalDays: life.lifeAtArrivalDays,
  });
  const runsOutOn = sim.runsOutAt ? formatDate(sim.runsOutAt, zone) : null;
  const orderByDate = a.orderBy ? formatDate(a.orderBy, zone) : null;
  const advice: StockAdvice = {
    ...a,
    text: adviceText(a, m, { runsOutOn, orderByDate, usable: usableOnHand, settings, lifeDays: life.lifeAtArrivalDays }),
    orderByDate,
    pack: a.pack ? { ...a.pack, text: packWarningText(a.pack, use.dailyUse, m.unit, openLife, life.lifeAtArrivalDays) } : null,
    ...life,
  };
  const item: StockItem = {
    materialId: m.id,
    code: m.code,
    name: m.name,
    kind: m.kind,
    unit: m.unit,
    onHand: { released: roundQty(onHand.released), onHold: roundQty(onHand.onHold), quarantined: roundQty(onHand.quarantined) },
    usableOnHand,
    expiredOnHand: roundQty(expiredOnHand),
    reorderPoint: m.reorderPoint === null ? null : Number(m.reorderPoint),
    orderQuantity: m.orderQuantity === null ? null : Number(m.orderQuantity),
    leadTimeDays: m.leadTimeDays,
    packSize,
    dailyUse: use.dailyUse,
    dailyUseSource: use.source,
    dailyUseHistory: use.history,
    dailyUsePlan: use.plan,
    daysOfCover,
    daysOfCoverIgnoringExpiry: use.dailyUse > 0 ? Math.round((usableOnHand / use.dailyUse) * 10) / 10 : null,
    coverBeyondHorizon: use.dailyUse > 0 && sim.runsOutAt === null,
    runsOutAt: sim.runsOutAt,
    runsOutOn,
    predictedWaste: sim.wasted,
    advice,
  };
  return { material: m, item, sim, counted, notCounted };
}
