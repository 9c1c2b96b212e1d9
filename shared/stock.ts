/**
 * Stock under first-expiry-first-out use (product brief, "What Tacklog computes", point 6).
 *
 * `simulateFefo` plays consumption forward in continuous time:
 *  - material is drawn at `dailyUse` per 24 h, without pause, from the `start` instant;
 *  - one container is in use at a time. An open container is used until it is empty or its
 *    effective expiry passes; only then is the next one taken;
 *  - the next one is a container already open (earliest effective expiry first), else the sealed
 *    container with the earliest expiry (ties: input order, stock on hand before incoming). From
 *    the moment it is opened its after-opening life counts: effective expiry = the earliest of
 *    its shelf expiry and openedAt + openLifeHours;
 *  - whatever a container holds when its effective expiry passes is waste: the one in use, and
 *    every sealed one that expires before its turn comes;
 *  - incoming orders join the stock at their arrival instant;
 *  - the stock runs out at the first instant at which material is needed and no usable container
 *    is on hand (an order arriving later may refill it: `runsOutAt` is the first such instant).
 *    With no use (dailyUse 0) nothing is opened and nothing runs out: `runsOutAt` is null and
 *    each container ends at its expiry (as waste) or at the horizon;
 *  - the simulation stops at start + horizonDays; what is left then is `left`.
 * For every container: used + wasted + left = its quantity. Pure; times are ISO instants.
 */

export const DAY_MS = 86_400_000;
export const HOUR_MS = 3_600_000;
export const DEFAULT_HORIZON_DAYS = 730;

export interface SimContainerInput {
  quantity: number;
  /** Shelf expiry (ISO instant) before any opening; null when nothing limits it. */
  expiresAt: string | null;
  /** Life after opening, hours; null or absent when opening does not shorten it. */
  openLifeHours?: number | null;
  /** Set when the container is already open at the start. */
  openedAt?: string | null;
}

export interface SimIncomingInput {
  arrivesAt: string;
  quantity: number;
  expiresAt: string | null;
  openLifeHours?: number | null;
}

export interface SimInput {
  start: string;
  dailyUse: number;
  containers: SimContainerInput[];
  incoming?: SimIncomingInput[];
  horizonDays?: number;
}

export type SimEnd = 'empty' | 'expired' | 'horizon';

export interface SimContainerResult {
  used: number;
  wasted: number;
  /** Still in the container at the horizon. */
  left: number;
  /** When it was (or will be) opened; null when never opened. */
  openedAt: string | null;
  /** Its effective expiry as simulated (after-opening life counted once opened); null: none. */
  expiresAt: string | null;
  endedAt: string;
  endedBy: SimEnd;
}

export interface SimResult {
  start: string;
  horizonAt: string;
  dailyUse: number;
  runsOutAt: string | null;
  used: number;
  wasted: number;
  left: number;
  /** On-hand containers, in input order. */
  containers: SimContainerResult[];
  /** Incoming orders, in input order. */
  incoming: SimContainerResult[];
  /** Indexes into containers (then incoming, as containers.length + i) in the order they are opened. */
  openOrder: number[];
}

interface Item {
  index: number;
  quantity: number;
  remaining: number;
  arrivesAt: number;
  shelfExpiry: number; // Infinity when none
  openLifeMs: number; // Infinity when none
  openedAt: number | null;
  used: number;
  wasted: number;
  left: number;
  endedAt: number | null;
  endedBy: SimEnd | null;
}

function parseInstant(iso: string, what: string): number {
  const t = Date.parse(iso);
  if (typeof iso !== 'string' || Number.isNaN(t)) throw new RangeError(`${what} "${String(iso)}" is not an ISO 8601 instant`);
  return t;
}

function checkQuantity(n: number, what: string): number {
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`${what} must be a number ≥ 0`);
  return n;
}

function effectiveExpiry(item: Item): number {
  if (item.openedAt === null) return item.shelfExpiry;
  return Math.min(item.shelfExpiry, item.openedAt + item.openLifeMs);
}

const iso = (t: number) => new Date(t).toISOString();

/** Rounds away float noise (quantities are kept to 1/1000 of a unit in the database). */
export function roundQty(n: number): number {
  return Math.round(n * 1e6) / 1e6;
}

export function simulateFefo(input: SimInput): SimResult {
  const start = parseInstant(input.start, 'start');
  const dailyUse = checkQuantity(input.dailyUse, 'dailyUse');
  const horizonDays = input.horizonDays ?? DEFAULT_HORIZON_DAYS;
  if (!Number.isFinite(horizonDays) || horizonDays <= 0) throw new RangeError('horizonDays must be a number > 0');
  const horizon = start + horizonDays * DAY_MS;
  const rate = dailyUse / DAY_MS; // per millisecond

  const lifeMs = (h: number | null | undefined, what: string) => {
    if (h === null || h === undefined) return Number.POSITIVE_INFINITY;
    if (!Number.isFinite(h) || h <= 0) throw new RangeError(`${what} must be a number > 0`);
    return h * HOUR_MS;
  };
  const items: Item[] = [
    ...input.containers.map((c, i) => ({
      index: i,
      quantity: checkQuantity(c.quantity, `containers.${i}.quantity`),
      remaining: c.quantity,
      arrivesAt: start,
      shelfExpiry: c.expiresAt ? parseInstant(c.expiresAt, `containers.${i}.expiresAt`) : Number.POSITIVE_INFINITY,
      openLifeMs: lifeMs(c.openLifeHours, `containers.${i}.openLifeHours`),
      openedAt: c.openedAt ? parseInstant(c.openedAt, `containers.${i}.openedAt`) : null,
      used: 0,
      wasted: 0,
      left: 0,
      endedAt: null,
      endedBy: null,
    })),
    ...(input.incoming ?? []).map((c, i) => ({
      index: input.containers.length + i,
      quantity: checkQuantity(c.quantity, `incoming.${i}.quantity`),
      remaining: c.quantity,
      arrivesAt: Math.max(start, parseInstant(c.arrivesAt, `incoming.${i}.arrivesAt`)),
      shelfExpiry: c.expiresAt ? parseInstant(c.expiresAt, `incoming.${i}.expiresAt`) : Number.POSITIVE_INFINITY,
      openLifeMs: lifeMs(c.openLifeHours, `incoming.${i}.openLifeHours`),
      openedAt: null,
      used: 0,
      wasted: 0,
      left: 0,
      endedAt: null,
      endedBy: null,
    })),
  ];
  for (const it of items) {
    if (it.openedAt !== null && it.openedAt > start) throw new RangeError(`container ${it.index}: openedAt is after the start`);
  }

  const openOrder: number[] = [];
  let runsOutAt: number | null = null;
  let t = start;

  /** Ends a container that is not in use: empty ones are done, the rest expire or reach the horizon. */
  const settleIdle = (it: Item) => {
    if (it.endedBy) return;
    if (it.arrivesAt >= horizon) {
      // Arrives after the horizon: not part of this look ahead.
      it.left = it.remaining;
      it.remaining = 0;
      it.endedAt = horizon;
      it.endedBy = 'horizon';
      return;
    }
    if (it.remaining <= 0) {
      it.endedBy = 'empty';
      it.endedAt = it.openedAt ?? it.arrivesAt;
      return;
    }
    const exp = effectiveExpiry(it);
    if (it.arrivesAt > start && exp <= it.arrivesAt) {
      // Delivered already expired: waste on arrival. (Stock on hand that expired before the
      // start keeps its own expiry as the moment it ended.)
      it.wasted = it.remaining;
      it.remaining = 0;
      it.endedAt = it.arrivesAt;
      it.endedBy = 'expired';
    } else if (exp < horizon) {
      it.wasted = it.remaining;
      it.remaining = 0;
      it.endedAt = exp;
      it.endedBy = 'expired';
    } else {
      it.left = it.remaining;
      it.remaining = 0;
      it.endedAt = horizon;
      it.endedBy = 'horizon';
    }
  };

  const usable = (it: Item, at: number) => !it.endedBy && it.remaining > 0 && it.arrivesAt <= at && effectiveExpiry(it) > at;

  if (rate > 0) {
    while (t < horizon) {
      const ready = items.filter((it) => usable(it, t));
      // Finish what is open first; else open the sealed container that expires first.
      const open = ready.filter((it) => it.openedAt !== null);
      const pool = open.length ? open : ready;
      const next = pool.reduce<Item | null>((best, it) => {
        if (!best) return it;
        const a = effectiveExpiry(it);
        const b = effectiveExpiry(best);
        return a < b || (a === b && it.index < best.index) ? it : best;
      }, null);
      if (!next) {
        runsOutAt ??= t;
        const arrivals = items.filter((it) => !it.endedBy && it.arrivesAt > t && it.arrivesAt < horizon).map((it) => it.arrivesAt);
        if (arrivals.length === 0) break;
        t = Math.min(...arrivals);
        continue;
      }
      if (next.openedAt === null) {
        next.openedAt = t;
        openOrder.push(next.index);
      } else if (!openOrder.includes(next.index)) {
        openOrder.push(next.index);
      }
      const expiry = effectiveExpiry(next);
      const emptyAt = t + next.remaining / rate;
      const end = Math.min(emptyAt, expiry, horizon);
      if (end === emptyAt) {
        next.used += next.remaining;
        next.remaining = 0;
        next.endedBy = 'empty';
      } else {
        const take = Math.min(next.remaining, rate * (end - t));
        next.used += take;
        next.remaining -= take;
        if (end === expiry) {
          next.wasted = next.remaining;
          next.endedBy = 'expired';
        } else {
          next.left = next.remaining;
          next.endedBy = 'horizon';
        }
        next.remaining = 0;
      }
      next.endedAt = end;
      t = end;
    }
  }
  for (const it of items) settleIdle(it);

  const out = (it: Item): SimContainerResult => {
    const exp = effectiveExpiry(it);
    return {
      used: roundQty(it.used),
      wasted: roundQty(it.wasted),
      left: roundQty(it.left),
      openedAt: it.openedAt === null ? null : iso(it.openedAt),
      expiresAt: Number.isFinite(exp) ? iso(exp) : null,
      endedAt: iso(it.endedAt ?? horizon),
      endedBy: it.endedBy ?? 'horizon',
    };
  };
  const containers = items.slice(0, input.containers.length).map(out);
  const incoming = items.slice(input.containers.length).map(out);
  const all = [...containers, ...incoming];
  const sum = (k: 'used' | 'wasted' | 'left') => roundQty(all.reduce((s, c) => s + c[k], 0));
  return {
    start: iso(start),
    horizonAt: iso(horizon),
    dailyUse,
    runsOutAt: runsOutAt === null ? null : iso(runsOutAt),
    used: sum('used'),
    wasted: sum('wasted'),
    left: sum('left'),
    containers,
    incoming,
    openOrder,
  };
}

/** Whole and part days between two instants (for days of cover). */
export function daysBetween(fromIso: string, toIso: string): number {
  return (Date.parse(toIso) - Date.parse(fromIso)) / DAY_MS;
}
