import { inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { settings } from '../../db/schema';
import { DEFAULT_HORIZON_DAYS } from '../../../shared/stock';

/**
 * Plant settings the stock view reads (rows of the `settings` table; the defaults apply when a
 * row is missing or not a positive number):
 *  - stockUseWindowDays (28): daily use from history = what finished step runs drew over this window;
 *  - stockPlanDays (1): open batches are this many days of building (batches go down the line in a day);
 *  - reorderSafetyDays (3): safety margin kept between an order's arrival and the run-out;
 *  - expiringSoonDays (14): "lots expiring soon" (shared with the compliance watch).
 */
export const STOCK_SETTING_DEFAULTS = {
  stockUseWindowDays: 28,
  stockPlanDays: 1,
  reorderSafetyDays: 3,
  expiringSoonDays: 14,
} as const;

export interface StockSettings {
  useWindowDays: number;
  planDays: number;
  safetyDays: number;
  horizonDays: number;
  expiringSoonDays: number;
}

export async function readStockSettings(tx: DbOrTx): Promise<StockSettings> {
  const keys = Object.keys(STOCK_SETTING_DEFAULTS);
  const rows = await tx.select({ key: settings.key, value: settings.value }).from(settings).where(inArray(settings.key, keys));
  const get = (key: keyof typeof STOCK_SETTING_DEFAULTS, allowZero = false): number => {
    const v = rows.find((r) => r.key === key)?.value;
    return typeof v === 'number' && Number.isFinite(v) && (v > 0 || (allowZero && v === 0)) ? v : STOCK_SETTING_DEFAULTS[key];
  };
  return {
    useWindowDays: get('stockUseWindowDays'),
    planDays: get('stockPlanDays'),
    safetyDays: get('reorderSafetyDays', true),
    horizonDays: DEFAULT_HORIZON_DAYS,
    expiringSoonDays: get('expiringSoonDays'),
  };
}
