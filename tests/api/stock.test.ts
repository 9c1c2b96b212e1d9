import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { materials, stepRuns } from '../../server/db/schema';
import { outlookSchema, simulateResultSchema, stockListSchema, stockMaterialSchema, stockTodaySchema } from '../../shared/schemas/stock';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createMix,
  createModel,
  createStation,
  createStepRun,
  createTwoPart,
  daysAgo,
} from '../helpers/fixtures';

const DAY = 86_400_000;
let app: TestApp;
let purchasing: TestUser, quality: TestUser, admin: TestUser, assembler: TestUser;
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
/** YYYY-MM-DD, `days` from today (UTC: the test plant's zone). */
const dateIn = (days: number) => new Date(Date.now() + days * DAY).toISOString().slice(0, 10);
/** A label date is usable through that day: it expires at the start of the next day (shared/expiry.ts). */
const endOfDate = (days: number) => Date.parse(`${dateIn(days + 1)}T00:00:00.000Z`);

/** A material whose history is `perDay` × 28 drawn from a now-empty container by a run finished 2 days ago. */
async function materialUsing(
  perDay: number,
  fields: Partial<typeof materials.$inferInsert> = {},
  opts: { openLifeHours?: number | null } = {},
) {
  const m = await createMaterial({ name: 'Stock test adhesive', openLifeHours: opts.openLifeHours ?? null, shelfLifeDays: 365 });
  await db.update(materials).set(fields).where(eq(materials.id, m.id));
  const station = await createStation();
  const model = await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId: m.id, amountPerUnit: 1 }] }] });
  const done = await createBatch({ modelId: model.id, status: 'completed' });
  const spent = await createLot({
    materialId: m.id,
    quantity: perDay * 28,
    remaining: 0,
    containerStatus: 'empty',
    receivedAt: daysAgo(40),
    status: 'used_up',
  });
  await createStepRun({
    batchId: done.id,
    stepId: model.steps[0].id,
    stationId: station.id,
    finishedAt: daysAgo(2),
    used: [{ containerId: spent.containers[0].id, quantity: perDay * 28 }],
  });
  return m;
}

beforeAll(async () => {
  app = await startApp();
  [purchasing, quality, admin, assembler] = await Promise.all([
    ensureUser(['purchasing']),
    ensureUser(['quality']),
    ensureUser(['admin']),
    ensureUser(['assembler']),
  ]);
});
afterAll(() => app.close());

describe('stock access and input', () => {
  it('401 when not signed in, 403 for a role without stock.read, 400 naming the field', async () => {
    for (const path of ['/api/stock', '/api/stock/outlook', '/api/stock/today']) {
      expect((await as().get(path)).status).toBe(401);
      expect((await as(assembler).get(path)).status).toBe(403);
    }
    expect((await as().post('/api/stock/simulate', { start: new Date().toISOString(), dailyUse: 1, containers: [] })).status).toBe(401);
    expect((await as(assembler).post('/api/stock/simulate', { start: new Date().toISOString(), dailyUse: 1, containers: [] })).status).toBe(
      403,
    );
    for (const u of [purchasing, quality, admin]) expect((await as(u).get('/api/stock')).status).toBe(200);

    const bad = await as(purchasing).post('/api/stock/simulate', { start: '2026-01-01T00:00:00Z', dailyUse: -1, containers: [] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { field: string }) => d.field)).toEqual(['dailyUse']);
    const early = await as(purchasing).post('/api/stock/simulate', {
      start: '2026-01-01T00:00:00Z',
      dailyUse: 1,
      containers: [{ quantity: 1, expiresAt: null, openedAt: '2026-01-02T00:00:00Z' }],
    });
    expect(early.body.error.details.map((d: { field: string }) => d.field)).toEqual(['containers.0.openedAt']);
    const q = await as(purchasing).get('/api/stock?sort=colour');
    expect(q.status).toBe(400);
    expect(q.body.error.details[0].field).toBe('query.sort');
    expect((await as(purchasing).get('/api/stock/outlook?weeks=0')).body.error.details[0].field).toBe('query.weeks');
    expect((await as(purchasing).get('/api/stock/materials/7')).status).toBe(400);
    expect((await as(purchasing).get('/api/stock/materials/00000000-0000-4000-8000-000000000000')).status).toBe(404);
  });
});

describe('POST /api/stock/simulate', () => {
  it('answers the contract: 30 kg in containers expiring on days 5, 12, 20 at 1 kg/day runs out on day 20, 10 kg wasted', async () => {
    // Worked by hand in tests/unit/stock-simulation.test.ts: used 5+7+8, wasted 5+3+2.
    const start = '2026-01-01T00:00:00.000Z';
    const day = (n: number) => new Date(Date.parse(start) + n * DAY).toISOString();
    const res = await as(purchasing).post('/api/stock/simulate', {
      start,
      dailyUse: 1,
      containers: [
        { quantity: 10, expiresAt: day(5) },
        { quantity: 10, expiresAt: day(12) },
        { quantity: 10, expiresAt: day(20) },
      ],
    });
    expect(res.status).toBe(200);
    const body = simulateResultSchema.parse(res.body);
    expect(body).toMatchObject({ runsOutAt: day(20), used: 20, wasted: 10 });
    expect(body.containers.map((c) => [c.used, c.wasted, c.openedAt, c.endedAt, c.endedBy])).toEqual([
      [5, 5, day(0), day(5), 'expired'],
      [7, 3, day(5), day(12), 'expired'],
      [8, 2, day(12), day(20), 'expired'],
    ]);
  });
});

describe('daily use', () => {
  it('from history: finished step runs in the 28-day window only, a mix split by its parts', async () => {
    const m = await createMaterial({ name: 'History glue' });
    const station = await createStation();
    const model = await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId: m.id, amountPerUnit: 2 }] }] });
    const batch = await createBatch({ modelId: model.id, status: 'completed' });
    const lot = await createLot({ materialId: m.id, containers: 4, quantity: 1000 });
    const [c1, c2, c3, c4] = lot.containers;
    const run = (containerId: string, quantity: number, finishedAt: Date | null) =>
      createStepRun({ batchId: batch.id, stepId: model.steps[0].id, stationId: station.id, finishedAt, used: [{ containerId, quantity }] });
    await run(c1.id, 56, daysAgo(3)); // counted
    await run(c2.id, 28, daysAgo(27)); // counted (inside 28 days)
    await run(c3.id, 500, daysAgo(29)); // outside the window
    await run(c4.id, 300, null); // not finished: nothing drawn yet
    // A two-part mix: 20 resin + 10 hardener; a run drew 15 of it → 10 resin, 5 hardener.
    const { resin, hardener } = await createTwoPart();
    const rl = await createLot({ materialId: resin.id, quantity: 200 });
    const hl = await createLot({ materialId: hardener.id, quantity: 200 });
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: rl.containers[0].id,
      hardenerContainerId: hl.containers[0].id,
      potLifeEndsAt: daysAgo(1),
    });
    await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      finishedAt: daysAgo(1),
      used: [{ mixId: mix.id, quantity: 15 }],
    });

    const list = stockListSchema.parse((await as(purchasing).get('/api/stock?view=all')).body);
    const row = (id: string) => list.items.find((i) => i.materialId === id)!;
    // (56 + 28) / 28 days = 3 per day
    expect(row(m.id)).toMatchObject({ dailyUse: 3, dailyUseSource: 'history', dailyUseHistory: 3, dailyUsePlan: null });
    expect(row(resin.id).dailyUse).toBeCloseTo(10 / 28, 6);
    expect(row(hardener.id).dailyUse).toBeCloseTo(5 / 28, 6);
    expect(list.settings.useWindowDays).toBe(28);
  });

  it('from the plan when an open batch still needs the material, and says so', async () => {
    const m = await createMaterial({ name: 'Planned glue' });
    const station = await createStation();
    const model = await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId: m.id, amountPerUnit: 1.5 }] }] });
    const batch = await createBatch({ modelId: model.id, quantity: 10, status: 'in_process' });
    const lot = await createLot({ materialId: m.id, quantity: 100 });
    const run = await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      finishedAt: daysAgo(0.1),
      used: [{ containerId: lot.containers[0].id, quantity: 6 }],
    });
    await db.update(stepRuns).set({ unitsDone: 4 }).where(eq(stepRuns.id, run.id));
    // 10 units − 4 done = 6 still to build × 1.5 = 9 over 1 plan day → 9 per day. History: 6 / 28.
    const item = stockListSchema.parse((await as(purchasing).get('/api/stock')).body).items.find((i) => i.materialId === m.id)!;
    expect(item).toMatchObject({ dailyUse: 9, dailyUseSource: 'plan', dailyUsePlan: 9 });
    expect(item.dailyUseHistory).toBeCloseTo(6 / 28, 6);
  });
});

describe('days of cover, waste and advice from the simulation', () => {
  let glue: Awaited<ReturnType<typeof createMaterial>>;
  const lotIds: string[] = [];
  let quarantinedId = '';

  beforeAll(async () => {
    // 1 per day from history; three 10-unit lots expiring 5, 12 and 20 days from today; lead time 30 days.
    glue = await materialUsing(1, { leadTimeDays: 30, orderQuantity: '50', reorderPoint: '5' });
    for (const d of [12, 5, 20]) lotIds.push((await createLot({ materialId: glue.id, quantity: 10, expiresOn: dateIn(d) })).id);
    quarantinedId = (await createLot({ materialId: glue.id, quantity: 40, status: 'quarantined', expiresOn: dateIn(300) })).id;
  });

  it('lasts until the last usable container expires, not on hand ÷ daily use, and wastes what expires', async () => {
    const now = Date.now();
    const item = stockListSchema.parse((await as(purchasing).get('/api/stock')).body).items.find((i) => i.materialId === glue.id)!;
    // Worked by hand (same rule as the 5/12/20 case): E5, E12, E20 = end of each label date.
    // Container 1 runs from now to E5 and wastes 10 − (E5 − now); container 2 runs E5→E12 (7 days,
    // wastes 3); container 3 runs E12→E20 (8 days, wastes 2). Runs out at E20.
    const used1 = (endOfDate(5) - now) / DAY;
    expect(Date.parse(item.runsOutAt!)).toBe(endOfDate(20));
    expect(item.runsOutOn).toBe(dateIn(21));
    expect(item.predictedWaste).toBeCloseTo(10 - used1 + 3 + 2, 2);
    expect(item.daysOfCover!).toBeCloseTo((endOfDate(20) - now) / DAY, 1);
    expect(item.daysOfCoverIgnoringExpiry).toBe(30);
    expect(item.daysOfCover!).toBeLessThan(item.daysOfCoverIgnoringExpiry!);
    expect(item.onHand).toEqual({ released: 30, onHold: 0, quarantined: 40 });
    expect(item.usableOnHand).toBe(30);
    // Runs out in ~21 days, inside the 30-day lead time: order now, one order quantity (need 1 × 33 days ≤ 50).
    expect(item.advice).toMatchObject({ action: 'order_now', runOutInsideLeadTime: true, orderQuantities: 1, quantity: 50 });
    expect(item.advice.text).toMatch(/^Order now: runs out \d{4}-\d{2}-\d{2}, inside the 30-day lead time\. Order 1 × 50 g/);
    expect(item.advice.lifeAtArrivalSource).toBe('receipts');
  });

  it('lists the containers in the order they will be used, quarantined stock apart', async () => {
    const res = await as(quality).get(`/api/stock/materials/${glue.id}`);
    expect(res.status).toBe(200);
    const body = stockMaterialSchema.parse(res.body);
    const counted = body.containers.filter((c) => c.counted);
    // The earliest expiry first: day 5, then 12, then 20.
    expect(counted.map((c) => c.lotId)).toEqual([lotIds[1], lotIds[0], lotIds[2]]);
    expect(counted.map((c) => c.useOrder)).toEqual([1, 2, 3]);
    expect(counted.map((c) => c.sim!.endedBy)).toEqual(['expired', 'expired', 'expired']);
    const apart = body.containers.filter((c) => !c.counted);
    expect(apart.map((c) => c.lotId)).toEqual([quarantinedId]);
    expect(apart[0].notCountedReason).toMatch(/quarantined/i);
  });

  it('outlook: quantity expiring per week split into used and waste, with the lots; CSV of the same', async () => {
    const o = outlookSchema.parse((await as(purchasing).get('/api/stock/outlook')).body);
    expect(o.weeks).toHaveLength(12);
    const s = o.series.find((x) => x.materialId === glue.id)!;
    const sum = (a: number[]) => a.reduce((x, y) => x + y, 0);
    // All 30 units expire inside 12 weeks: 20 used before expiry, the rest waste.
    expect(sum(s.used) + sum(s.wasted)).toBeCloseTo(30, 3);
    expect(sum(s.used)).toBeCloseTo(30 - (10 - (endOfDate(5) - Date.now()) / DAY + 5), 1);
    const lots = o.lots.filter((l) => l.materialId === glue.id);
    expect(lots.map((l) => l.lotId)).toEqual([lotIds[1], lotIds[0], lotIds[2]]);
    expect(lots[1]).toMatchObject({ quantity: 10, usedBeforeExpiry: 7, predictedWaste: 3 });

    const csv = await as(purchasing).get('/api/stock/outlook?format=csv');
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/);
    const lines = (csv.body as string).split('\r\n');
    expect(lines[0]).toBe(
      'Week of (date),Expires (UTC),Material,Supplier lot,Lot status,Expiring (unit),Used before expiry (unit),Predicted waste (unit),Unit',
    );
    expect(lines.find((l) => l.includes(glue.code) && l.includes(',10,7,3,'))).toBeTruthy();
  });

  it('CSV of the stock table: RFC 4180, units in the header, the filtered rows', async () => {
    const res = await as(purchasing).get(`/api/stock?format=csv&q=${glue.code}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="?stock-\d{4}-\d{2}-\d{2}\.csv"?$/);
    const text = res.body as string;
    expect(text.endsWith('\r\n')).toBe(true);
    const lines = text.split('\r\n').filter(Boolean);
    expect(lines).toHaveLength(2);
    expect(lines[0]).toContain(
      'Daily use (unit/day),Daily use from,Days of cover (days),Runs out (date in UTC),Predicted waste (unit),Advice',
    );
    // The advice sentence holds commas: quoted (RFC 4180 §2.6).
    expect(lines[1]).toMatch(new RegExp(`^${glue.code},"?Stock test adhesive [^,]*"?,g,30,0,40,5,1,history,`));
    expect(lines[1]).toContain(`,${dateIn(21)},`);
    expect(lines[1]).toMatch(/"Order now: runs out [^"]+"/);
  });

  it('the purchasing home lists the run-out inside lead time, waste this month and lots expiring in 14 days', async () => {
    const t = stockTodaySchema.parse((await as(purchasing).get('/api/stock/today')).body);
    expect(t.runOuts.map((r) => r.materialId)).toContain(glue.id);
    expect(t.expiringLots.days).toBe(14);
    const expiring = t.expiringLots.items.filter((l) => lotIds.includes(l.lotId)).map((l) => l.lotId);
    expect(expiring).toEqual([lotIds[1], lotIds[0]]);
    const monthEnd = Date.parse(t.wasteThisMonth.monthEnd);
    const wastedThisMonth = t.wasteThisMonth.items.find((w) => w.materialId === glue.id);
    // The day-5 container's waste falls in this month unless day 5 is already next month.
    if (endOfDate(5) < monthEnd) expect(wastedThisMonth!.quantity).toBeGreaterThan(0);
    else expect(wastedThisMonth).toBeUndefined();
  });

  it('filters, searches and sorts on the server', async () => {
    const waste = stockListSchema.parse((await as(purchasing).get('/api/stock?view=waste')).body);
    expect(waste.items.every((i) => i.predictedWaste > 0 || i.expiredOnHand > 0)).toBe(true);
    expect(waste.items.some((i) => i.materialId === glue.id)).toBe(true);
    const search = stockListSchema.parse((await as(purchasing).get(`/api/stock?q=${glue.code.toLowerCase()}`)).body);
    expect(search.items.map((i) => i.materialId)).toEqual([glue.id]);
    const sorted = stockListSchema.parse((await as(purchasing).get('/api/stock?sort=predictedWaste&dir=desc')).body);
    const wastes = sorted.items.map((i) => i.predictedWaste);
    expect(wastes).toEqual([...wastes].sort((a, b) => b - a));
  });
});

describe('pack size warning on real data', () => {
  it('at 400 g/day a 5000 g tin open for 7 days wastes 2200 g each time; 2000 g packs would waste none', async () => {
    // 0.4 kg/day × 7 days = 2.8 kg used per opening; 5 − 2.8 = 2.2 kg waste (the brief's example, in grams).
    const m = await materialUsing(400, { leadTimeDays: 10, orderQuantity: '20000' }, { openLifeHours: 168 });
    await createLot({ materialId: m.id, containers: 2, quantity: 5000, expiresOn: dateIn(300) });
    const item = stockListSchema.parse((await as(purchasing).get('/api/stock')).body).items.find((i) => i.materialId === m.id)!;
    expect(item.packSize).toBe(5000);
    expect(item.advice.pack).toMatchObject({
      packSize: 5000,
      usablePerPack: 2800,
      wastePerPack: 2200,
      suggestedPackSize: 2000,
      limitedBy: 'open_life',
    });
    expect(item.advice.pack!.text).toBe(
      'At 400 g/day a 5000 g pack open for 7 days wastes 2200 g each time; 2000 g packs would waste none.',
    );
    // Two tins, each open 7 days: 14 days of cover, not 25 (10 000 g ÷ 400 g/day); 4400 g wasted.
    expect(item.daysOfCover).toBeCloseTo(14, 1);
    expect(item.predictedWaste).toBeCloseTo(4400, 3);
  });
});
