import { DateTime } from 'luxon';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, drivers } from '../../server/db/schema';
import {
  batchCreatedSchema,
  batchDetailSchema,
  batchPageSchema,
  batchScanResultSchema,
  driverScanResultSchema,
} from '../../shared/schemas/batches';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createModel,
  createStation,
  createStepRun,
  createTwoPart,
  hoursAgo,
} from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
let quality: TestUser;
let receiving: TestUser;
let model: Awaited<ReturnType<typeof createModel>>;
let station: Awaited<ReturnType<typeof createStation>>;
let glue: Awaited<ReturnType<typeof createMaterial>>;

beforeAll(async () => {
  app = await startApp();
  [assembler, quality, receiving] = await Promise.all([ensureUser(['assembler']), ensureUser(['quality']), ensureUser(['receiving'])]);
  station = await createStation();
  glue = await createMaterial({ name: 'Cap glue', cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440 } });
  model = await createModel({
    steps: [
      { name: 'Cap', stationKind: station.kind, waitForCure: true, materials: [{ materialId: glue.id, amountPerUnit: 1 }] },
      { name: 'Test', stationKind: station.kind },
    ],
  });
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

describe('build batches', () => {
  it('401, 403 for receiving, 400 naming quantity / modelId, 404 unknown model', async () => {
    expect((await as().post('/api/batches', { modelId: model.id, quantity: 2 })).status).toBe(401);
    expect((await as(receiving).post('/api/batches', { modelId: model.id, quantity: 2 })).status).toBe(403);
    for (const quantity of [0, 1.5, 10001, '3']) {
      const res = await as(assembler).post('/api/batches', { modelId: model.id, quantity });
      expect(res.status).toBe(400);
      expect(res.body.error.details[0].field).toBe('quantity');
    }
    expect((await as(assembler).post('/api/batches', { modelId: 'x', quantity: 2 })).body.error.details[0].field).toBe('modelId');
    expect((await as(assembler).post('/api/batches', { modelId: '00000000-0000-4000-8000-000000000000', quantity: 2 })).status).toBe(404);
    expect((await as().get('/api/batches')).status).toBe(401);
  });

  it('creates a batch with readable, unique serials <model>-<yyMMdd>-<seq>-<unit> (201, audited)', async () => {
    const res = await as(assembler).post('/api/batches', { modelId: model.id, quantity: 12 });
    expect(res.status).toBe(201);
    const { batch, drivers: units } = batchCreatedSchema.parse(res.body);
    const day = DateTime.now().toFormat('yyMMdd');
    expect(batch.code).toMatch(new RegExp(`^${model.code}-${day}-\\d{2,}$`));
    expect(batch).toMatchObject({ modelId: model.id, quantity: 12, status: 'open', createdBy: assembler.id });
    expect(units).toHaveLength(12);
    expect(units[0].serial).toBe(`${batch.code}-0001`);
    expect(units[11].serial).toBe(`${batch.code}-0012`);
    expect(new Set(units.map((u) => u.serial)).size).toBe(12);
    expect(await db.select().from(drivers).where(eq(drivers.batchId, batch.id))).toHaveLength(12);
    expect(await db.select().from(auditLog).where(eq(auditLog.entityId, batch.id))).toHaveLength(1);

    // Quality may open one too; the day's sequence moves on.
    const second = batchCreatedSchema.parse((await as(quality).post('/api/batches', { modelId: model.id, quantity: 1 })).body);
    expect(Number(second.batch.code.split('-').pop())).toBe(Number(batch.code.split('-').pop()) + 1);
  });

  it('opens batches concurrently without a code clash', async () => {
    const results = await Promise.all(
      Array.from({ length: 5 }, () => as(assembler).post('/api/batches', { modelId: model.id, quantity: 3 })),
    );
    expect(results.map((r) => r.status)).toEqual([201, 201, 201, 201, 201]);
    expect(new Set(results.map((r) => r.body.batch.code)).size).toBe(5);
  });

  it('lists with paging and filters', async () => {
    const page = batchPageSchema.parse((await as(receiving).get(`/api/batches?modelId=${model.id}&limit=2&offset=0`)).body);
    expect(page.items).toHaveLength(2);
    expect(page.total).toBeGreaterThanOrEqual(7);
    const open = batchPageSchema.parse((await as(receiving).get(`/api/batches?modelId=${model.id}&status=completed`)).body);
    expect(open.total).toBe(0);
    expect((await as(receiving).get('/api/batches?status=nope')).status).toBe(400);
    expect((await as(receiving).get('/api/batches?limit=0')).body.error.details[0].field).toBe('query.limit');
  });

  it('the traveler marks each step material that is one part of a two-part adhesive (the station offers mixing only there)', async () => {
    const epoxy = await createTwoPart();
    const mixing = await createModel({
      steps: [
        {
          name: 'Bond',
          stationKind: station.kind,
          materials: [
            { materialId: epoxy.resin.id, amountPerUnit: 2 },
            { materialId: epoxy.hardener.id, amountPerUnit: 2 },
          ],
        },
        { name: 'Cap', stationKind: station.kind, materials: [{ materialId: glue.id, amountPerUnit: 1 }] },
      ],
    });
    const batch = await createBatch({ modelId: mixing.id, quantity: 1 });
    const detail = batchDetailSchema.parse((await as(assembler).get(`/api/batches/${batch.id}`)).body);
    expect(detail.steps[0].materials.map((m) => [m.materialId, m.twoPart])).toEqual([
      [epoxy.resin.id, true],
      [epoxy.hardener.id, true],
    ]);
    expect(detail.steps[1].materials.map((m) => m.twoPart)).toEqual([false]);
  });

  it('the traveler shows each step as pending / running / curing until X / done', async () => {
    const batch = await createBatch({ modelId: model.id, quantity: 2 });
    let detail = batchDetailSchema.parse((await as(receiving).get(`/api/batches/${batch.id}`)).body);
    expect(detail.steps.map((s) => s.state)).toEqual(['pending', 'pending']);
    expect(detail.currentStepId).toBe(model.steps[0].id);
    expect(detail.drivers).toHaveLength(2);

    const lot = await createLot({ materialId: glue.id, containerStatus: 'open', openedAt: hoursAgo(3) });
    const finishedAt = hoursAgo(2);
    await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      finishedAt,
      used: [{ containerId: lot.containers[0].id, quantity: 2 }],
    });
    detail = batchDetailSchema.parse((await as(receiving).get(`/api/batches/${batch.id}`)).body);
    expect(detail.steps[0].state).toBe('curing');
    // No reading in the area: the reference temperature holds, so 24 h from the finish (cure profile of the fixture).
    expect(Date.parse(detail.steps[0].cureCompleteAt!)).toBe(finishedAt.getTime() + 24 * 3_600_000);
    expect(detail.steps[0].run?.materials[0]).toMatchObject({ containerCode: lot.containers[0].code, quantityUsed: 2 });
    expect(detail.currentStepId).toBe(model.steps[1].id);

    const old = await createBatch({ modelId: model.id, quantity: 1 });
    await createStepRun({
      batchId: old.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      finishedAt: hoursAgo(30),
      used: [{ containerId: lot.containers[0].id, quantity: 1 }],
    });
    await createStepRun({ batchId: old.id, stepId: model.steps[1].id, stationId: station.id, finishedAt: null, startedAt: hoursAgo(1) });
    detail = batchDetailSchema.parse((await as(receiving).get(`/api/batches/${old.id}`)).body);
    expect(detail.steps.map((s) => s.state)).toEqual(['done', 'running']);
    expect((await as(receiving).get('/api/batches/00000000-0000-4000-8000-000000000000')).status).toBe(404);
  });

  it('scanning a traveler resolves the batch and where it goes next; scanning a serial resolves the driver', async () => {
    const batch = await createBatch({ modelId: model.id, quantity: 2 });
    const res = await as(receiving).post('/api/scans/resolve', { code: `${batch.code.toLowerCase()}\r\n` });
    expect(res.status).toBe(200);
    const scanned = batchScanResultSchema.parse(res.body);
    expect(scanned.batch.id).toBe(batch.id);
    expect(scanned.currentStep).toMatchObject({ id: model.steps[0].id, stationKind: station.kind });
    const unit = await as(receiving).post('/api/scans/resolve', { code: batch.drivers[1].serial });
    expect(driverScanResultSchema.parse(unit.body)).toMatchObject({ driver: { id: batch.drivers[1].id }, batch: { id: batch.id } });
    expect((await as(receiving).post('/api/scans/resolve', { code: `${batch.code}-9999` })).status).toBe(404);
  });
});
