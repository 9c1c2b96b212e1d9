import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { simulateFefo, type SimContainerInput, type SimIncomingInput } from '../../shared/stock';

// Hand-worked cases. Day n means start + n × 24 h; quantities in kg. The working is written
// beside each case so it can be checked with pencil and paper.
const START = '2026-01-01T00:00:00.000Z';
const day = (n: number) => new Date(Date.parse(START) + n * 86_400_000).toISOString();

describe('FEFO simulation, hand-worked', () => {
  it('30 kg in three 10 kg containers expiring on days 5, 12 and 20 at 1 kg/day lasts 20 days and wastes 10 kg', () => {
    // Container 1 (exp. day 5) is opened at day 0: days 0–5 use 5 kg, 5 kg left at day 5 → waste 5.
    // Container 2 (exp. day 12) opened at day 5: days 5–12 use 7 kg, 3 kg left → waste 3.
    // Container 3 (exp. day 20) opened at day 12: days 12–20 use 8 kg, 2 kg left → waste 2.
    // Nothing usable at day 20 → runs out at day 20. Used 5+7+8 = 20, wasted 5+3+2 = 10.
    // Not 30 days (on hand ÷ daily use = 30 ÷ 1).
    const r = simulateFefo({
      start: START,
      dailyUse: 1,
      // given out of order on purpose: FEFO must pick by expiry, not by input order
      containers: [
        { quantity: 10, expiresAt: day(12) },
        { quantity: 10, expiresAt: day(20) },
        { quantity: 10, expiresAt: day(5) },
      ],
    });
    expect(r.runsOutAt).toBe(day(20));
    expect(r.used).toBe(20);
    expect(r.wasted).toBe(10);
    expect(r.left).toBe(0);
    expect(r.openOrder).toEqual([2, 0, 1]);
    expect(r.containers).toEqual([
      { used: 7, wasted: 3, left: 0, openedAt: day(5), expiresAt: day(12), endedAt: day(12), endedBy: 'expired' },
      { used: 8, wasted: 2, left: 0, openedAt: day(12), expiresAt: day(20), endedAt: day(20), endedBy: 'expired' },
      { used: 5, wasted: 5, left: 0, openedAt: day(0), expiresAt: day(5), endedAt: day(5), endedBy: 'expired' },
    ]);
  });

  it('after-opening life shorter than a container takes to use: 5 kg tins, 7 days open, 0.4 kg/day', () => {
    // Tin 1 opened day 0, open life 7 days → effective expiry day 7 (shelf expiry day 100 later).
    //   Used 0.4 × 7 = 2.8 kg, waste 5 − 2.8 = 2.2 kg at day 7.
    // Tin 2 opened day 7, expires day 14: used 2.8, waste 2.2.
    // Runs out at day 14 (10 kg would last 25 days at 0.4 kg/day if opening did not count).
    const tin: SimContainerInput = { quantity: 5, expiresAt: day(100), openLifeHours: 7 * 24 };
    const r = simulateFefo({ start: START, dailyUse: 0.4, containers: [tin, tin] });
    expect(r.containers[0]).toMatchObject({ used: 2.8, wasted: 2.2, openedAt: day(0), expiresAt: day(7), endedBy: 'expired' });
    expect(r.containers[1]).toMatchObject({ used: 2.8, wasted: 2.2, openedAt: day(7), expiresAt: day(14), endedBy: 'expired' });
    expect(r.runsOutAt).toBe(day(14));
    expect(r.used).toBe(5.6);
    expect(r.wasted).toBe(4.4);
  });

  it('an already open container is finished first, its open life counted from when it was opened', () => {
    // Open container: 4 kg left, opened 5 days before the start, open life 10 days → expires day 5.
    // Sealed container: 10 kg, shelf expiry day 3 (earlier!) — but the open one is finished first.
    //   Days 0–4: open container empties (4 kg at 1 kg/day) at day 4.
    //   The sealed one expired at day 3, unopened → 10 kg waste at day 3.
    //   Nothing usable at day 4 → runs out at day 4.
    const r = simulateFefo({
      start: START,
      dailyUse: 1,
      containers: [
        { quantity: 10, expiresAt: day(3) },
        { quantity: 4, expiresAt: day(200), openLifeHours: 240, openedAt: day(-5) },
      ],
    });
    expect(r.containers[1]).toMatchObject({ used: 4, wasted: 0, endedAt: day(4), endedBy: 'empty', expiresAt: day(5) });
    expect(r.containers[0]).toMatchObject({ used: 0, wasted: 10, openedAt: null, endedAt: day(3), endedBy: 'expired' });
    expect(r.runsOutAt).toBe(day(4));
  });

  it('incoming stock arriving mid-way refills after a stock-out; runsOutAt is the first stock-out', () => {
    // On hand: 3 kg, expiry day 50. 1 kg/day → empty at day 3: first stock-out at day 3.
    // Incoming: 5 kg arriving day 4 (expiry day 6, opened at arrival): days 4–6 use 2, waste 3.
    // Incoming: 10 kg arriving day 5 (expiry day 30): waits while the day-4 delivery is open;
    //   opened day 6, used 10 by day 16. Then nothing left → second stock-out at day 16.
    // Used 3 + 2 + 10 = 15, wasted 3.
    const incoming: SimIncomingInput[] = [
      { arrivesAt: day(5), quantity: 10, expiresAt: day(30) },
      { arrivesAt: day(4), quantity: 5, expiresAt: day(6) },
    ];
    const r = simulateFefo({ start: START, dailyUse: 1, containers: [{ quantity: 3, expiresAt: day(50) }], incoming });
    expect(r.runsOutAt).toBe(day(3));
    expect(r.containers[0]).toMatchObject({ used: 3, wasted: 0, endedAt: day(3), endedBy: 'empty' });
    expect(r.incoming[1]).toMatchObject({ used: 2, wasted: 3, openedAt: day(4), endedAt: day(6), endedBy: 'expired' });
    expect(r.incoming[0]).toMatchObject({ used: 10, wasted: 0, openedAt: day(6), endedAt: day(16), endedBy: 'empty' });
    expect(r.used).toBe(15);
    expect(r.wasted).toBe(3);
  });

  it('incoming arriving while a container is open waits for it: the open container is used until empty', () => {
    // On hand 10 kg (expiry day 40). Incoming 10 kg on day 2 expiring day 8 (earlier!).
    // The open container is not set aside: it runs days 0–10. The delivery expires sealed at
    // day 8 → 10 kg waste. Runs out at day 10.
    const r = simulateFefo({
      start: START,
      dailyUse: 1,
      containers: [{ quantity: 10, expiresAt: day(40) }],
      incoming: [{ arrivesAt: day(2), quantity: 10, expiresAt: day(8) }],
    });
    expect(r.containers[0]).toMatchObject({ used: 10, endedAt: day(10), endedBy: 'empty' });
    expect(r.incoming[0]).toMatchObject({ used: 0, wasted: 10, openedAt: null, endedAt: day(8), endedBy: 'expired' });
    expect(r.runsOutAt).toBe(day(10));
  });

  it('zero use: nothing is opened, nothing runs out, what expires inside the horizon is waste', () => {
    // 2 kg expiring day 30 → waste at day 30; 3 kg expiring day 500 (after a 365-day horizon) →
    // left at the horizon; 1 kg with no expiry → left.
    const r = simulateFefo({
      start: START,
      dailyUse: 0,
      horizonDays: 365,
      containers: [
        { quantity: 2, expiresAt: day(30) },
        { quantity: 3, expiresAt: day(500) },
        { quantity: 1, expiresAt: null },
      ],
    });
    expect(r.runsOutAt).toBeNull();
    expect(r.used).toBe(0);
    expect(r.wasted).toBe(2);
    expect(r.left).toBe(4);
    expect(r.containers.map((c) => c.endedBy)).toEqual(['expired', 'horizon', 'horizon']);
    expect(r.containers[1]).toMatchObject({ openedAt: null, endedAt: day(365) });
  });

  it('an already expired container is waste at once and never used', () => {
    // 6 kg that expired 2 days before the start: waste 6, ended at its expiry (day −2).
    // 4 kg expiring day 10 at 1 kg/day: used by day 4 → runs out at day 4 (not day 10).
    const r = simulateFefo({
      start: START,
      dailyUse: 1,
      containers: [
        { quantity: 6, expiresAt: day(-2) },
        { quantity: 4, expiresAt: day(10) },
      ],
    });
    expect(r.containers[0]).toEqual({
      used: 0,
      wasted: 6,
      left: 0,
      openedAt: null,
      expiresAt: day(-2),
      endedAt: day(-2),
      endedBy: 'expired',
    });
    expect(r.containers[1]).toMatchObject({ used: 4, endedAt: day(4), endedBy: 'empty' });
    expect(r.runsOutAt).toBe(day(4));
    expect(r.wasted).toBe(6);
  });

  it('a delivery that arrives already expired is waste on arrival; one after the horizon is left out', () => {
    // Delivery A: 5 kg arriving day 3 with expiry day 2 → unusable, 5 kg waste at day 3 (not day 2).
    // Delivery B: 4 kg arriving day 40, horizon 30 days → not reached: left 4, ended at the horizon.
    // On hand 10 kg (no expiry) at 1 kg/day: used up at day 10; A is never usable → runs out at day 10.
    const r = simulateFefo({
      start: START,
      dailyUse: 1,
      horizonDays: 30,
      containers: [{ quantity: 10, expiresAt: null }],
      incoming: [
        { arrivesAt: day(3), quantity: 5, expiresAt: day(2) },
        { arrivesAt: day(40), quantity: 4, expiresAt: null },
      ],
    });
    expect(r.incoming[0]).toMatchObject({ used: 0, wasted: 5, openedAt: null, endedAt: day(3), endedBy: 'expired' });
    expect(r.incoming[1]).toMatchObject({ used: 0, wasted: 0, left: 4, endedAt: day(30), endedBy: 'horizon' });
    expect(r.runsOutAt).toBe(day(10));
    expect(r).toMatchObject({ used: 10, wasted: 5, left: 4 });
  });

  it('stops at the horizon with the container in use partly left', () => {
    // 100 kg, no expiry, 1 kg/day, horizon 30 days: used 30, left 70, does not run out.
    const r = simulateFefo({ start: START, dailyUse: 1, horizonDays: 30, containers: [{ quantity: 100, expiresAt: null }] });
    expect(r.containers[0]).toMatchObject({ used: 30, left: 70, wasted: 0, endedBy: 'horizon', endedAt: day(30) });
    expect(r.runsOutAt).toBeNull();
  });

  it('refuses input it cannot use', () => {
    expect(() => simulateFefo({ start: 'soon', dailyUse: 1, containers: [] })).toThrow(/start/);
    expect(() => simulateFefo({ start: START, dailyUse: -1, containers: [] })).toThrow(/dailyUse/);
    expect(() => simulateFefo({ start: START, dailyUse: 1, containers: [{ quantity: 1, expiresAt: null, openedAt: day(1) }] })).toThrow(
      /openedAt/,
    );
  });
});

describe('FEFO simulation, properties (fast-check)', () => {
  const dayOffset = fc.integer({ min: -30, max: 400 });
  const maybeLife = fc.option(fc.integer({ min: 1, max: 24 * 60 }), { nil: null });
  const container = fc.record({
    quantity: fc.double({ min: 0, max: 500, noNaN: true }),
    expiresAt: fc.option(dayOffset.map(day), { nil: null }),
    openLifeHours: maybeLife,
    openedAt: fc.option(fc.integer({ min: -60, max: 0 }).map(day), { nil: null }),
  });
  const incoming = fc.record({
    arrivesAt: fc.integer({ min: 0, max: 300 }).map(day),
    quantity: fc.double({ min: 0, max: 500, noNaN: true }),
    expiresAt: fc.option(dayOffset.map(day), { nil: null }),
    openLifeHours: maybeLife,
  });
  const input = fc.record({
    dailyUse: fc.oneof(fc.constant(0), fc.double({ min: 0.001, max: 200, noNaN: true })),
    containers: fc.array(container, { maxLength: 12 }),
    incoming: fc.array(incoming, { maxLength: 5 }),
    horizonDays: fc.integer({ min: 1, max: 800 }),
  });

  it('for every container used + wasted + left = its quantity, and nothing is negative', () => {
    fc.assert(
      fc.property(input, (i) => {
        const r = simulateFefo({ start: START, ...i });
        const all = [...r.containers, ...r.incoming];
        const given = [...i.containers, ...i.incoming];
        all.forEach((c, k) => {
          expect(c.used).toBeGreaterThanOrEqual(0);
          expect(c.wasted).toBeGreaterThanOrEqual(0);
          expect(c.left).toBeGreaterThanOrEqual(0);
          expect(c.used + c.wasted + c.left).toBeCloseTo(given[k].quantity, 5);
        });
        const onHand = given.reduce((s, c) => s + c.quantity, 0);
        expect(r.used + r.wasted + r.left).toBeCloseTo(onHand, 4);
      }),
      { numRuns: 400 },
    );
  });

  it('never uses more than the daily rate allows, and never uses a container past its effective expiry', () => {
    fc.assert(
      fc.property(input, (i) => {
        const r = simulateFefo({ start: START, ...i });
        expect(r.used).toBeLessThanOrEqual(i.dailyUse * i.horizonDays + 1e-6);
        for (const c of [...r.containers, ...r.incoming]) {
          if (c.expiresAt !== null)
            expect(Date.parse(c.endedAt)).toBeLessThanOrEqual(Math.max(Date.parse(c.expiresAt), Date.parse(r.horizonAt)));
          if (c.used > 0) expect(c.openedAt).not.toBeNull();
          expect(Date.parse(c.endedAt)).toBeLessThanOrEqual(Date.parse(r.horizonAt));
        }
        if (i.dailyUse === 0) expect(r.runsOutAt).toBeNull();
      }),
      { numRuns: 400 },
    );
  });

  it('without expiry, cover is on hand ÷ daily use (the simulation adds nothing when nothing expires)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.5, max: 100, noNaN: true }), { minLength: 1, maxLength: 8 }),
        fc.double({ min: 0.1, max: 50, noNaN: true }),
        (quantities, dailyUse) => {
          const onHand = quantities.reduce((s, q) => s + q, 0);
          const r = simulateFefo({
            start: START,
            dailyUse,
            horizonDays: 10_000,
            containers: quantities.map((q) => ({ quantity: q, expiresAt: null })),
          });
          const days = (Date.parse(r.runsOutAt!) - Date.parse(START)) / 86_400_000;
          expect(days).toBeCloseTo(onHand / dailyUse, 4);
          expect(r.wasted).toBe(0);
        },
      ),
      { numRuns: 200 },
    );
  });
});
