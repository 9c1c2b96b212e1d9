/**
 * Purchasing's stock view: GET /api/stock (+ CSV), one material's containers in the order of
 * use, the expiry outlook (+ CSV), today's three things to act on, and the bare simulation.
 */
import { DateTime } from 'luxon';
import { db, type DbOrTx } from '../../db/client';
import { badRequest, notFound } from '../../errors';
import { requirePermission, type Actor } from '../auth/actor';
import { formatDate, formatDateTime } from '../../../shared/plant-time';
import { qty } from '../../../shared/reorder';
import { simulateFefo, type SimResult } from '../../../shared/stock';
import {
  OUTLOOK_COLUMNS,
  type Outlook,
  type OutlookLot,
  type SimulateInput,
  type StockContainer,
  type StockItem,
  type StockList,
  type StockMaterial,
  type StockQuery,
  type StockToday,
} from '../../../shared/schemas/stock';
import { PLANT_ZONE } from '../lots/present';
import { toCsv } from '../../csv';
import { loadStockData } from './load';
import { buildMaterialModel, type MaterialModel } from './model';
import { readStockSettings, type StockSettings } from './settings';

export { STOCK_SETTING_DEFAULTS } from './settings';

async function models(tx: DbOrTx, now: Date, materialId?: string): Promise<{ list: MaterialModel[]; settings: StockSettings }> {
  const settings = await readStockSettings(tx);
  const data = await loadStockData(tx, now, settings.useWindowDays, materialId);
  return { list: data.materials.map((m) => buildMaterialModel(m, data, settings, now, PLANT_ZONE)), settings };
}

const needsOrder = (i: StockItem) => i.advice.action === 'order_now' || i.advice.action === 'order_soon';

function matches(i: StockItem, q: StockQuery): boolean {
  if (q.view === 'act' && !(needsOrder(i) || i.predictedWaste > 0 || i.expiredOnHand > 0)) return false;
  if (q.view === 'waste' && !(i.predictedWaste > 0 || i.expiredOnHand > 0)) return false;
  if (q.view === 'reorder' && !needsOrder(i)) return false;
  if (q.q) {
    const needle = q.q.toLowerCase();
    if (!i.code.toLowerCase().includes(needle) && !i.name.toLowerCase().includes(needle)) return false;
  }
  return true;
}

/** Sort key; null (never runs out, nothing to order) sorts last in either direction. */
function sortKey(i: StockItem, sort: StockQuery['sort']): number | string | null {
  switch (sort) {
    case 'code':
      return i.code;
    case 'daysOfCover':
      return i.daysOfCover;
    case 'runsOutAt':
      return i.runsOutAt ? Date.parse(i.runsOutAt) : null;
    case 'predictedWaste':
      return i.predictedWaste;
    case 'orderBy':
      return i.advice.orderBy ? Date.parse(i.advice.orderBy) : null;
    case 'usableOnHand':
      return i.usableOnHand;
  }
}

export function sortStock(items: StockItem[], sort: StockQuery['sort'], dir: StockQuery['dir']): StockItem[] {
  const sign = dir === 'desc' ? -1 : 1;
  return [...items].sort((a, b) => {
    const x = sortKey(a, sort);
    const y = sortKey(b, sort);
    if (x === null || y === null) return x === y ? a.code.localeCompare(b.code) : x === null ? 1 : -1;
    const c = typeof x === 'string' ? x.localeCompare(String(y)) : x - (y as number);
    return c !== 0 ? sign * c : a.code.localeCompare(b.code);
  });
}

export async function listStock(actor: Actor, query: StockQuery, now = new Date()): Promise<StockList> {
  requirePermission(actor, 'stock.read');
  const { list, settings } = await models(db, now);
  const items = sortStock(
    list.map((m) => m.item).filter((i) => matches(i, query)),
    query.sort,
    query.dir,
  );
  return { items, total: items.length, asOf: now.toISOString(), zone: PLANT_ZONE, settings };
}

/** The stock table as CSV (RFC 4180): the screen's columns, units in the header, plant time. */
export function stockCsvBody(list: StockList): string {
  const header = [
    'Material code',
    'Material',
    'Unit',
    'Released (unit)',
    'On hold (unit)',
    'Quarantined (unit)',
    'Reorder point (unit)',
    'Daily use (unit/day)',
    'Daily use from',
    'Days of cover (days)',
    `Runs out (date in ${list.zone})`,
    'Predicted waste (unit)',
    'Advice',
    'Order by (date)',
    'Order quantity suggested (unit)',
    'Pack warning',
  ];
  const rows = list.items.map((i) => [
    i.code,
    i.name,
    i.unit,
    qty(i.onHand.released),
    qty(i.onHand.onHold),
    qty(i.onHand.quarantined),
    i.reorderPoint === null ? '' : qty(i.reorderPoint),
    qty(i.dailyUse),
    i.dailyUseSource === 'plan' ? 'plan' : 'history',
    i.daysOfCover === null ? (i.coverBeyondHorizon ? `more than ${list.settings.horizonDays}` : '') : qty(i.daysOfCover),
    i.runsOutOn ?? '',
    qty(i.predictedWaste),
    i.advice.text,
    i.advice.orderByDate ?? '',
    i.advice.quantity === null ? '' : qty(i.advice.quantity),
    i.advice.pack?.text ?? '',
  ]);
  return toCsv([header, ...rows]);
}

export async function stockCsv(actor: Actor, query: StockQuery, now = new Date()): Promise<{ filename: string; body: string }> {
  const list = await listStock(actor, query, now);
  return { filename: `stock-${formatDate(now, PLANT_ZONE)}.csv`, body: stockCsvBody(list) };
}

/** One material: its stock row and its containers in the order they will be used. */
export async function materialStock(actor: Actor, materialId: string, now = new Date()): Promise<StockMaterial> {
  requirePermission(actor, 'stock.read');
  const { list } = await models(db, now, materialId);
  const model = list[0];
  if (!model) throw notFound('The material');
  const orderOf = new Map(model.sim.openOrder.map((idx, pos) => [idx, pos + 1]));
  const counted: StockContainer[] = model.counted.map((c, idx) => ({
    containerId: c.row.container.id,
    code: c.row.container.code,
    lotId: c.row.lot.id,
    supplierLot: c.row.lot.supplierLot,
    lotStatus: c.row.lot.status,
    status: c.row.container.status,
    remaining: Number(c.row.container.remaining),
    location: c.row.container.location,
    useOrder: orderOf.get(idx) ?? null,
    expiresAt: c.expiryNow.at,
    counted: true,
    notCountedReason: null,
    sim: model.sim.containers[idx],
  }));
  // Used ones in the order they are opened, then those that will not be used, by when they end.
  counted.sort((a, b) => (a.useOrder ?? Infinity) - (b.useOrder ?? Infinity) || Date.parse(a.sim!.endedAt) - Date.parse(b.sim!.endedAt));
  const others: StockContainer[] = model.notCounted.map((n) => ({
    containerId: n.row.container.id,
    code: n.row.container.code,
    lotId: n.row.lot.id,
    supplierLot: n.row.lot.supplierLot,
    lotStatus: n.row.lot.status,
    status: n.row.container.status,
    remaining: Number(n.row.container.remaining),
    location: n.row.container.location,
    useOrder: null,
    expiresAt: n.expiryNow.at,
    counted: false,
    notCountedReason: n.reason,
    sim: null,
  }));
  return { item: model.item, containers: [...counted, ...others], asOf: now.toISOString(), zone: PLANT_ZONE };
}

/** Monday-started weeks in the plant zone, from the current week. */
function outlookWeeks(now: Date, weeks: number, zone: string): DateTime[] {
  const first = DateTime.fromJSDate(now).setZone(zone).startOf('week');
  return Array.from({ length: weeks + 1 }, (_, i) => first.plus({ weeks: i }));
}

export async function expiryOutlook(actor: Actor, weeks: number, now = new Date()): Promise<Outlook> {
  requirePermission(actor, 'stock.read');
  const { list } = await models(db, now);
  const bounds = outlookWeeks(now, weeks, PLANT_ZONE);
  const edges = bounds.map((b) => b.toMillis());
  const weekOf = (t: number) => {
    for (let i = 0; i < weeks; i++) if (t >= edges[i] && t < edges[i + 1]) return i;
    return -1;
  };
  const series: Outlook['series'] = [];
  const lots = new Map<string, OutlookLot>();
  for (const model of list) {
    const used = new Array<number>(weeks).fill(0);
    const wasted = new Array<number>(weeks).fill(0);
    model.counted.forEach((c, idx) => {
      const r = model.sim.containers[idx];
      if (!r.expiresAt) return;
      const t = Date.parse(r.expiresAt);
      const w = weekOf(t);
      if (w < 0) return;
      used[w] += r.used;
      wasted[w] += r.wasted;
      const key = c.row.lot.id;
      const lot = lots.get(key) ?? {
        lotId: key,
        supplierLot: c.row.lot.supplierLot,
        lotStatus: c.row.lot.status,
        materialId: model.material.id,
        materialCode: model.material.code,
        materialName: model.material.name,
        unit: model.material.unit,
        expiresAt: r.expiresAt,
        week: w,
        quantity: 0,
        usedBeforeExpiry: 0,
        predictedWaste: 0,
      };
      if (t < Date.parse(lot.expiresAt)) Object.assign(lot, { expiresAt: r.expiresAt, week: w });
      lot.quantity += r.used + r.wasted + r.left;
      lot.usedBeforeExpiry += r.used;
      lot.predictedWaste += r.wasted;
      lots.set(key, lot);
    });
    if (used.some((v) => v > 0) || wasted.some((v) => v > 0)) {
      const round = (a: number[]) => a.map((v) => Math.round(v * 1000) / 1000);
      series.push({
        materialId: model.material.id,
        code: model.material.code,
        name: model.material.name,
        unit: model.material.unit,
        used: round(used),
        wasted: round(wasted),
      });
    }
  }
  const lotList = [...lots.values()]
    .map((l) => ({
      ...l,
      quantity: Math.round(l.quantity * 1000) / 1000,
      usedBeforeExpiry: Math.round(l.usedBeforeExpiry * 1000) / 1000,
      predictedWaste: Math.round(l.predictedWaste * 1000) / 1000,
    }))
    .sort((a, b) => Date.parse(a.expiresAt) - Date.parse(b.expiresAt) || a.materialCode.localeCompare(b.materialCode));
  return {
    asOf: now.toISOString(),
    zone: PLANT_ZONE,
    weeks: bounds.slice(0, weeks).map((b, i) => ({ start: b.toISODate()!, end: bounds[i + 1].minus({ days: 1 }).toISODate()! })),
    series,
    lots: lotList,
  };
}

const LOT_STATUS_WORDS: Record<string, string> = {
  released: 'Released',
  on_hold: 'On hold',
  quarantined: 'Quarantined',
  rejected: 'Rejected',
  used_up: 'Used up',
};

export function outlookCsvBody(o: Outlook): string {
  const labels: Record<(typeof OUTLOOK_COLUMNS)[number]['key'], string> = {
    week: 'Week of (date)',
    expiresAt: `Expires (${o.zone})`,
    material: 'Material',
    supplierLot: 'Supplier lot',
    lotStatus: 'Lot status',
    quantity: 'Expiring (unit)',
    usedBeforeExpiry: 'Used before expiry (unit)',
    predictedWaste: 'Predicted waste (unit)',
  };
  const header = [...OUTLOOK_COLUMNS.map((c) => labels[c.key]), 'Unit'];
  const rows = o.lots.map((l) => [
    o.weeks[l.week].start,
    formatDateTime(l.expiresAt, o.zone),
    `${l.materialCode} ${l.materialName}`,
    l.supplierLot,
    LOT_STATUS_WORDS[l.lotStatus] ?? l.lotStatus,
    qty(l.quantity),
    qty(l.usedBeforeExpiry),
    qty(l.predictedWaste),
    l.unit,
  ]);
  return toCsv([header, ...rows]);
}

export async function expiryOutlookCsv(actor: Actor, weeks: number, now = new Date()) {
  const o = await expiryOutlook(actor, weeks, now);
  return { filename: `expiry-outlook-${formatDate(now, PLANT_ZONE)}.csv`, body: outlookCsvBody(o) };
}

/** The purchasing home page: run-outs inside lead time, predicted waste this month, lots expiring soon. */
export async function stockToday(actor: Actor, now = new Date()): Promise<StockToday> {
  requirePermission(actor, 'stock.read');
  return todayFigures(now);
}

/** The three things of purchasing's day (also the purchasing part of the daily digest). */
export async function todayFigures(now = new Date()): Promise<StockToday> {
  const { list, settings } = await models(db, now);
  const monthEnd = DateTime.fromJSDate(now).setZone(PLANT_ZONE).endOf('month').plus({ milliseconds: 1 }).toMillis();
  const soon = now.getTime() + settings.expiringSoonDays * 86_400_000;
  const runOuts = list
    .filter((m) => m.item.advice.runOutInsideLeadTime)
    .sort((a, b) => Date.parse(a.item.runsOutAt ?? '') - Date.parse(b.item.runsOutAt ?? ''))
    .map((m) => ({
      materialId: m.material.id,
      code: m.material.code,
      name: m.material.name,
      unit: m.material.unit,
      runsOutAt: m.item.runsOutAt,
      leadTimeDays: m.material.leadTimeDays,
      adviceText: m.item.advice.text,
    }));
  const waste = list
    .map((m) => ({
      materialId: m.material.id,
      code: m.material.code,
      name: m.material.name,
      unit: m.material.unit,
      quantity:
        Math.round(
          m.sim.containers.reduce((s, c) => s + (c.endedBy === 'expired' && Date.parse(c.endedAt) < monthEnd ? c.wasted : 0), 0) * 1000,
        ) / 1000,
    }))
    .filter((w) => w.quantity > 0)
    .sort((a, b) => a.code.localeCompare(b.code));
  const expiring = new Map<string, StockToday['expiringLots']['items'][number]>();
  for (const m of list) {
    for (const c of m.counted) {
      const at = c.expiryNow.at ? Date.parse(c.expiryNow.at) : null;
      if (at === null || at > soon) continue;
      const lot = c.row.lot;
      const entry = expiring.get(lot.id) ?? {
        lotId: lot.id,
        supplierLot: lot.supplierLot,
        lotStatus: lot.status,
        materialCode: m.material.code,
        materialName: m.material.name,
        unit: m.material.unit,
        expiresAt: c.expiryNow.at!,
        remaining: 0,
      };
      if (at < Date.parse(entry.expiresAt)) entry.expiresAt = c.expiryNow.at!;
      entry.remaining = Math.round((entry.remaining + c.input.quantity) * 1000) / 1000;
      expiring.set(lot.id, entry);
    }
  }
  return {
    asOf: now.toISOString(),
    zone: PLANT_ZONE,
    runOuts,
    wasteThisMonth: { monthEnd: new Date(monthEnd).toISOString(), items: waste },
    expiringLots: {
      days: settings.expiringSoonDays,
      items: [...expiring.values()].sort((a, b) => Date.parse(a.expiresAt) - Date.parse(b.expiresAt)),
    },
  };
}

/** POST /api/stock/simulate: the bare simulation (shared/stock.ts) on the caller's figures. */
export function simulateStock(actor: Actor, input: SimulateInput): SimResult {
  requirePermission(actor, 'stock.read');
  try {
    return simulateFefo(input);
  } catch (err) {
    if (err instanceof RangeError) throw badRequest(err.message);
    throw err;
  }
}
