import type { DbOrTx } from '../../db/client';
import { formatDate } from '../../../shared/plant-time';
import { qty } from '../../../shared/reorder';
import type { PurchasingFigures } from '../mail/templates/digest';
import { todayFigures } from './index';

/**
 * Purchasing's part of the daily digest from the stock figures (the FEFO simulation behind the
 * Stock page): run-outs inside lead time, stock predicted to expire before use this month, and
 * lots expiring within the warning window — the same three things as the purchasing home page.
 */
export async function purchasingFiguresFromStock(_tx: DbOrTx, now: Date, zone: string): Promise<PurchasingFigures> {
  const t = await todayFigures(now);
  return {
    source: 'from the stock figures (first-expiry-first-out at the current daily use), as on the Stock page',
    runOuts: t.runOuts.map((r) => ({
      title: `${r.name} (${r.code})`,
      detail: `${r.runsOutAt ? `Runs out ${formatDate(r.runsOutAt, zone)}` : 'Out of usable stock'}${r.leadTimeDays !== null ? `, inside its ${r.leadTimeDays}-day lead time` : ''}. ${r.adviceText}`,
      path: `/stock/materials/${r.materialId}`,
    })),
    predictedWaste: t.wasteThisMonth.items.map((w) => ({
      title: `${w.name} (${w.code})`,
      detail: `${qty(w.quantity)} ${w.unit} predicted to expire before it can be used, by ${formatDate(t.wasteThisMonth.monthEnd, zone)}.`,
      path: `/stock/materials/${w.materialId}`,
    })),
    expiringLots: t.expiringLots.items.map((l) => ({
      title: `Lot ${l.supplierLot} of ${l.materialName} (${l.materialCode})`,
      detail: `${qty(l.remaining)} ${l.unit} left; expires ${formatDate(l.expiresAt, zone)}.`,
      path: `/lots/${l.lotId}`,
    })),
    windowDays: t.expiringLots.days,
  };
}
