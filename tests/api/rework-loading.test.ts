import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { containers, drivers } from '../../server/db/schema';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createLot, createMaterial, createModel, createStation } from '../helpers/fixtures';

// A failed driver of a finished batch is reworked at a station: its new material is loaded for
// that unit (serial), the rework run consumes for one unit, and the driver keeps both histories.
describe('loading material for a rework', () => {
  let app: TestApp;
  let assembler: TestUser;
  let station: Awaited<ReturnType<typeof createStation>>;
  let model: Awaited<ReturnType<typeof createModel>>;
  let batch: Awaited<ReturnType<typeof createBatch>>;
  let cone: Awaited<ReturnType<typeof createLot>>;

  beforeAll(async () => {
    app = await startApp();
    assembler = await ensureUser(['assembler']);
    station = await createStation({ kind: 'moving_parts' });
    const coneMat = await createMaterial({ name: 'Paper cone', kind: 'cone', unit: 'pcs' });
    model = await createModel({ steps: [{ stationKind: 'moving_parts', materials: [{ materialId: coneMat.id, amountPerUnit: 1 }] }] });
    batch = await createBatch({ modelId: model.id, quantity: 3, status: 'completed' });
    await db.update(drivers).set({ status: 'failed' }).where(eq(drivers.id, batch.drivers[0].id));
    await db.update(drivers).set({ status: 'passed' }).where(eq(drivers.id, batch.drivers[1].id));
    cone = await createLot({ materialId: coneMat.id, quantity: 10 });
  });
  afterAll(() => app.close());

  const load = (body: Record<string, unknown>) =>
    api(app.baseUrl, assembler.token).post(`/api/stations/${station.id}/load`, {
      batchId: batch.id,
      containerCode: cone.containers[0].code,
      ...body,
    });

  it('refuses a finished batch without a serial (BATCH_CLOSED) and a driver that did not fail', async () => {
    expect((await load({})).body.error.code).toBe('BATCH_CLOSED');
    const passed = await load({ serial: batch.drivers[1].serial });
    expect(passed.status).toBe(409);
    expect(passed.body.error.code).toBe('NOT_FOR_REWORK');
    const unknown = await load({ serial: 'NO-SUCH-SERIAL' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.details[0].field).toBe('serial');
    const stepOnly = await api(app.baseUrl, assembler.token).post(`/api/stations/${station.id}/load`, {
      batchId: batch.id,
      containerCode: cone.containers[0].code,
      stepId: model.steps[0].id,
    });
    expect(stepOnly.status).toBe(400);
    expect(stepOnly.body.error.details[0].field).toBe('stepId');
  });

  it('loads for the failed driver and the rework consumes one unit', async () => {
    const serial = batch.drivers[0].serial;
    const res = await load({ serial, stepId: model.steps[0].id });
    expect(res.status).toBe(200);
    expect(res.body.accepted).toBe(true);
    const body = { stationId: station.id, stepId: model.steps[0].id };
    const start = await api(app.baseUrl, assembler.token).post(`/api/drivers/${serial}/rework/start`, body);
    expect(start.status).toBe(200);
    const finish = await api(app.baseUrl, assembler.token).post(`/api/drivers/${serial}/rework/finish`, body);
    expect(finish.status).toBe(200);
    expect(finish.body.driver.status).toBe('reworked');
    const [c] = await db.select().from(containers).where(eq(containers.id, cone.containers[0].id));
    expect(Number(c.remaining)).toBe(9);
    const trace = await api(app.baseUrl, assembler.token).get(`/api/drivers/${serial}/trace`);
    expect(trace.status).toBe(200);
    const rework = (trace.body.steps as { kind: string; materials: { containerCode: string }[] }[]).filter((s) => s.kind === 'rework');
    expect(rework).toHaveLength(1);
    expect(rework[0].materials.map((m) => m.containerCode)).toContain(cone.containers[0].code);
  });
});
