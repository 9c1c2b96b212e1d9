/**
 * Daily use and reorder advice for one material (product brief, "What Tacklog computes", point 6).
 * Pure: every input is passed in, quantities are in the material's unit, times are ISO instants.
 */
import { DAY_MS, HOUR_MS, roundQty } from './stock';

export type DailyUseSource = 'history' | 'plan';

export interface DailyUseInput {
  /** Quantity drawn by finished step runs inside the window. */
  historyQuantity: number;
  windowDays: number;
  /** What open batches still need: recipe amount × units still to build, summed. */
  planQuantity: number;
  /** Over how many days the open batches are built (setting). */
  planDays: number;
}

export interface DailyUse {
  dailyUse: number;
  source: DailyUseSource;
  history: number;
  plan: number | null;
}

/**
 * Daily use from the plan when open batches still need the material (they say what the line is
 * about to draw), otherwise from what finished step runs drew over the window.
 */
export function chooseDailyUse(input: DailyUseInput): DailyUse {
  if (!(input.windowDays > 0) || !(input.planDays > 0)) throw new RangeError('windowDays and planDays must be > 0');
  const history = roundQty(Math.max(0, input.historyQuantity) / input.windowDays);
  if (input.planQuantity > 0) {
    const plan = roundQty(input.planQuantity / input.planDays);
    return { dailyUse: plan, source: 'plan', history, plan };
  }
  return { dailyUse: history, source: 'history', history, plan: null };
}

/** The median of a list (mean of the middle two for an even count); null for an empty list. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * Pack sizes on the 1-2-5 series (1, 2, 5, 10, 20, 50 …; common practice for pack and container
 * sizes): the largest one not above `limit`, or null when limit is not positive.
 */
export function packSizeAtMost(limit: number): number | null {
  if (!(limit > 0) || !Number.isFinite(limit)) return null;
  let decade = 10 ** Math.floor(Math.log10(limit));
  // Guard against log10 rounding (e.g. 1000 → 2.9999…).
  if (decade * 10 <= limit + 1e-9) decade *= 10;
  const m = [5, 2, 1].find((k) => k * decade <= limit + 1e-9) ?? 1;
  return roundQty(m * decade);
}

export interface PackCheckInput {
  dailyUse: number;
  packSize: number;
  /** Life after opening, hours (null: opening does not shorten it). */
  openLifeHours: number | null;
  /** Shelf life left when a delivery arrives, days (null: unknown or unlimited). */
  lifeAtArrivalDays: number | null;
}

export interface PackWarning {
  packSize: number;
  /** What one pack gives before it expires at the current rate. */
  usablePerPack: number;
  wastePerPack: number;
  limitedBy: 'open_life' | 'shelf_life';
  /** A pack size on the 1-2-5 series that would be used up in time; null when none would. */
  suggestedPackSize: number | null;
}

/**
 * Whether one pack, opened and used at `dailyUse`, expires before it is empty: it lasts
 * packSize ÷ dailyUse days, but only the after-opening life (or the shelf life left at arrival,
 * when shorter) is allowed. Null when the pack is used up in time or nothing is used.
 */
export function packWaste(input: PackCheckInput): PackWarning | null {
  const { dailyUse, packSize } = input;
  if (!(dailyUse > 0) || !(packSize > 0)) return null;
  const openDays = input.openLifeHours === null ? Number.POSITIVE_INFINITY : (input.openLifeHours * HOUR_MS) / DAY_MS;
  const shelfDays = input.lifeAtArrivalDays === null ? Number.POSITIVE_INFINITY : Math.max(0, input.lifeAtArrivalDays);
  const days = Math.min(openDays, shelfDays);
  if (!Number.isFinite(days)) return null;
  const usable = dailyUse * days;
  if (usable >= packSize - 1e-9) return null;
  return {
    packSize,
    usablePerPack: roundQty(usable),
    wastePerPack: roundQty(packSize - usable),
    limitedBy: openDays <= shelfDays ? 'open_life' : 'shelf_life',
    suggestedPackSize: packSizeAtMost(usable),
  };
}

export type AdviceAction = 'order_now' | 'order_soon' | 'enough' | 'not_used';

export interface AdviceInput {
  now: string;
  dailyUse: number;
  /** From the FEFO simulation; null when the stock lasts past the horizon or nothing is used. */
  runsOutAt: string | null;
  usableOnHand: number;
  reorderPoint: number | null;
  orderQuantity: number | null;
  leadTimeDays: number | null;
  safetyDays: number;
  /** Order within this many days counts as "soon". */
  soonDays?: number;
  packSize: number | null;
  openLifeHours: number | null;
  lifeAtArrivalDays: number | null;
}

export interface Advice {
  action: AdviceAction;
  /** Latest instant to place the order (run-out − lead time − safety margin). */
  orderBy: string | null;
  /** Suggested order, a whole number of order quantities (or the shortfall when none is set). */
  quantity: number | null;
  orderQuantities: number | null;
  /** The largest order that would still be used before it expires, when that limits the order. */
  limitedByShelfLife: boolean;
  /** Runs out before an order placed now could arrive. */
  runOutInsideLeadTime: boolean;
  belowReorderPoint: boolean;
  pack: PackWarning | null;
}

/**
 * Reorder advice: order by (run-out − lead time − safety margin); how much in whole order
 * quantities, enough to cover the lead time and safety margin at the current rate, and never
 * more than can be used in the shelf life left at arrival (at least one order quantity); and
 * whether a pack expires before it is used up.
 */
export function reorderAdvice(a: AdviceInput): Advice {
  const now = Date.parse(a.now);
  const lead = a.leadTimeDays ?? 0;
  const belowReorderPoint = a.reorderPoint !== null && a.usableOnHand < a.reorderPoint;
  const pack = a.packSize
    ? packWaste({ dailyUse: a.dailyUse, packSize: a.packSize, openLifeHours: a.openLifeHours, lifeAtArrivalDays: a.lifeAtArrivalDays })
    : null;
  if (!(a.dailyUse > 0)) {
    return {
      action: belowReorderPoint ? 'order_soon' : 'not_used',
      orderBy: null,
      quantity: belowReorderPoint ? a.orderQuantity : null,
      orderQuantities: belowReorderPoint && a.orderQuantity ? 1 : null,
      limitedByShelfLife: false,
      runOutInsideLeadTime: false,
      belowReorderPoint,
      pack,
    };
  }
  const runOut = a.runsOutAt === null ? null : Date.parse(a.runsOutAt);
  const orderBy = runOut === null ? null : runOut - (lead + a.safetyDays) * DAY_MS;
  const runOutInsideLeadTime = runOut !== null && runOut < now + lead * DAY_MS;
  const soon = (a.soonDays ?? 14) * DAY_MS;
  const action: AdviceAction =
    (orderBy !== null && orderBy <= now) || belowReorderPoint
      ? 'order_now'
      : orderBy !== null && orderBy <= now + soon
        ? 'order_soon'
        : 'enough';

  let quantity: number | null = null;
  let orderQuantities: number | null = null;
  let limitedByShelfLife = false;
  if (action !== 'enough') {
    const need = a.dailyUse * (lead + a.safetyDays);
    const maxUsable = a.lifeAtArrivalDays === null ? Number.POSITIVE_INFINITY : a.dailyUse * Math.max(0, a.lifeAtArrivalDays);
    if (a.orderQuantity && a.orderQuantity > 0) {
      let n = Math.max(1, Math.ceil(need / a.orderQuantity - 1e-9));
      const fit = Math.floor(maxUsable / a.orderQuantity + 1e-9);
      if (n > fit) {
        limitedByShelfLife = true;
        n = Math.max(1, fit);
      }
      orderQuantities = n;
      quantity = roundQty(n * a.orderQuantity);
    } else {
      quantity = roundQty(Math.min(need, maxUsable));
      limitedByShelfLife = maxUsable < need;
    }
  }
  return {
    action,
    orderBy: orderBy === null ? null : new Date(orderBy).toISOString(),
    quantity,
    orderQuantities,
    limitedByShelfLife,
    runOutInsideLeadTime,
    belowReorderPoint,
    pack,
  };
}

/** Numbers as people read them: at most three decimals, no trailing zeros. */
export function qty(n: number): string {
  return String(Math.round(n * 1000) / 1000);
}

/** The pack warning as a sentence: "at 0.4 kg/day a 5 kg tin opened for 7 days wastes 2.2 kg each time; …". */
export function packWarningText(
  w: PackWarning,
  dailyUse: number,
  unit: string,
  openLifeHours: number | null,
  lifeAtArrivalDays: number | null,
): string {
  const limit =
    w.limitedBy === 'open_life' && openLifeHours !== null
      ? `open for ${qty(openLifeHours / 24)} days`
      : `with ${qty(lifeAtArrivalDays ?? 0)} days of shelf life left at arrival`;
  const better =
    w.suggestedPackSize !== null ? `${qty(w.suggestedPackSize)} ${unit} packs would waste none` : 'no pack size would be used up in time';
  return `At ${qty(dailyUse)} ${unit}/day a ${qty(w.packSize)} ${unit} pack ${limit} wastes ${qty(w.wastePerPack)} ${unit} each time; ${better}.`;
}
