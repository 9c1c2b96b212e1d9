import { describe, expect, it } from 'vitest';
import { chooseDailyUse, median, packSizeAtMost, packWarningText, packWaste, reorderAdvice, type AdviceInput } from '../../shared/reorder';

const NOW = '2026-03-02T08:00:00.000Z';
const day = (n: number) => new Date(Date.parse(NOW) + n * 86_400_000).toISOString();

describe('daily use', () => {
  it('from history: what finished runs drew over the window ÷ window days', () => {
    // 840 g over 28 days → 30 g/day.
    expect(chooseDailyUse({ historyQuantity: 840, windowDays: 28, planQuantity: 0, planDays: 1 })).toEqual({
      dailyUse: 30,
      source: 'history',
      history: 30,
      plan: null,
    });
  });
  it('from the plan when open batches still need the material, saying so and keeping the history figure', () => {
    // open batches need 450 g over 3 planned days → 150 g/day.
    expect(chooseDailyUse({ historyQuantity: 840, windowDays: 28, planQuantity: 450, planDays: 3 })).toEqual({
      dailyUse: 150,
      source: 'plan',
      history: 30,
      plan: 150,
    });
  });
});

describe('median', () => {
  it('odd and even counts (the usual definition)', () => {
    expect(median([5, 1, 3])).toBe(3);
    expect(median([4, 1, 3, 10])).toBe(3.5);
    expect(median([])).toBeNull();
  });
});

describe('pack size warning', () => {
  it('at 0.4 kg/day a 5 kg tin opened for 7 days wastes 2.2 kg each time; 2 kg tins would waste none', () => {
    // Used while open: 0.4 × 7 = 2.8 kg; waste 5 − 2.8 = 2.2 kg. The largest 1-2-5 pack size not
    // above 2.8 kg is 2 kg (1 kg would do too; 2 kg is fewer openings).
    const w = packWaste({ dailyUse: 0.4, packSize: 5, openLifeHours: 7 * 24, lifeAtArrivalDays: 200 });
    expect(w).toEqual({ packSize: 5, usablePerPack: 2.8, wastePerPack: 2.2, limitedBy: 'open_life', suggestedPackSize: 2 });
    expect(packWarningText(w!, 0.4, 'kg', 168, 200)).toBe(
      'At 0.4 kg/day a 5 kg pack open for 7 days wastes 2.2 kg each time; 2 kg packs would waste none.',
    );
  });
  it('no warning when a pack is used up in time', () => {
    // 1 kg/day × 7 days = 7 kg ≥ 5 kg pack.
    expect(packWaste({ dailyUse: 1, packSize: 5, openLifeHours: 168, lifeAtArrivalDays: 200 })).toBeNull();
    expect(packWaste({ dailyUse: 0, packSize: 5, openLifeHours: 168, lifeAtArrivalDays: 200 })).toBeNull();
  });
  it('shelf life left at arrival can be the limit', () => {
    // 10 g/day, no open-life limit, 30 days left at arrival → 300 g usable of a 1000 g pack.
    const w = packWaste({ dailyUse: 10, packSize: 1000, openLifeHours: null, lifeAtArrivalDays: 30 });
    expect(w).toMatchObject({ usablePerPack: 300, wastePerPack: 700, limitedBy: 'shelf_life', suggestedPackSize: 200 });
  });
  it('1-2-5 series (common practice for pack sizes)', () => {
    expect([2.8, 1000, 999, 0.5, 0.07, 7].map(packSizeAtMost)).toEqual([2, 1000, 500, 0.5, 0.05, 5]);
    expect(packSizeAtMost(0)).toBeNull();
  });
});

describe('reorder advice', () => {
  const base: AdviceInput = {
    now: NOW,
    dailyUse: 100,
    runsOutAt: day(30),
    usableOnHand: 3000,
    reorderPoint: 1000,
    orderQuantity: 2000,
    leadTimeDays: 14,
    safetyDays: 3,
    packSize: 500,
    openLifeHours: null,
    lifeAtArrivalDays: 300,
  };

  it('order by run-out − lead time − safety margin', () => {
    // Runs out day 30; 30 − 14 − 3 = day 13 → more than 14 days away? No: 13 ≤ 14 → order soon.
    const a = reorderAdvice(base);
    expect(a.orderBy).toBe(day(13));
    expect(a.action).toBe('order_soon');
    // Need over lead time + margin: 100 × 17 = 1700 → one order quantity of 2000.
    expect(a).toMatchObject({ quantity: 2000, orderQuantities: 1, runOutInsideLeadTime: false, limitedByShelfLife: false });
  });

  it('enough stock: no order yet', () => {
    const a = reorderAdvice({ ...base, runsOutAt: day(60) });
    // 60 − 17 = day 43, beyond the next 14 days.
    expect(a).toMatchObject({ action: 'enough', orderBy: day(43), quantity: null });
  });

  it('run-out inside the lead time: order now, in whole order quantities covering lead time + margin', () => {
    // Runs out day 5 < 14-day lead time. Need 250/day × 17 days = 4250 → ⌈4250 / 2000⌉ = 3 × 2000.
    const a = reorderAdvice({ ...base, dailyUse: 250, runsOutAt: day(5) });
    expect(a).toMatchObject({ action: 'order_now', runOutInsideLeadTime: true, orderQuantities: 3, quantity: 6000, orderBy: day(-12) });
  });

  it('never orders more than the shelf life left at arrival lets the plant use (at least one order quantity)', () => {
    // Need 3 × 2000 as above, but only 250 × 10 days = 2500 usable before expiry → 1 × 2000.
    const a = reorderAdvice({ ...base, dailyUse: 250, runsOutAt: day(5), lifeAtArrivalDays: 10 });
    expect(a).toMatchObject({ orderQuantities: 1, quantity: 2000, limitedByShelfLife: true });
  });

  it('below the reorder point orders now even when the simulation runs long', () => {
    const a = reorderAdvice({ ...base, usableOnHand: 800, runsOutAt: day(90) });
    expect(a).toMatchObject({ action: 'order_now', belowReorderPoint: true, orderQuantities: 1 });
  });

  it('not used: no order date, and the pack check is skipped', () => {
    const a = reorderAdvice({ ...base, dailyUse: 0, runsOutAt: null });
    expect(a).toMatchObject({ action: 'not_used', orderBy: null, quantity: null, pack: null });
  });

  it('carries the pack warning', () => {
    // 0.4 kg/day, 5 kg packs, 7 days open (see the pack size cases above).
    const a = reorderAdvice({ ...base, dailyUse: 0.4, runsOutAt: day(200), packSize: 5, openLifeHours: 168, orderQuantity: 20 });
    expect(a.pack).toMatchObject({ wastePerPack: 2.2, suggestedPackSize: 2 });
  });
});
