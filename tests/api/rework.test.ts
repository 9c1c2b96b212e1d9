import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, containers, drivers } from '../../server/db/schema';
import { driverDetailSchema, reworkResultSchema } from '../../shared/schemas/drivers';
import { driverTraceSchema, lotTraceSchema } from '../../shared/schemas/trace';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { buildTraceScenario, type TraceScenario } from '../helpers/trace-scenario';

let app: TestApp;
let s: TraceScenario;
let assembler: TestUser;
let quality: TestUser;
/** Batch 1's unit 3: failed final test in the scenario. */
let serial: string;

beforeAll(async () => {
  app = await startApp();
  s = await buildTraceScenario();
  [assembler, quality] = await Promise.all([ensureUser(['assembler']), ensureUser(['quality'])]);
  serial = s.batches.b1.serials[2];
});
afterAll(() => app.close());

const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const statusOf = async (sn: string) => (await db.select().from(drivers).where(eq(drivers.serial, sn)))[0].status;
const remainingOf = async (code: string) => Number((await db.select().from(containers).where(eq(containers.code, code)))[0].remaining);
const moving = () => ({ stationId: s.stations.mov.id, stepId: s.steps[1].id });
/** Loads a container at a station for this unit's rework (the station-loading endpoint). */
const loadForRework = (stationId: string, stepId: string, containerCode: string) =>
  as(assembler).post(`/api/stations/${stationId}/load`, { batchId: s.batches.b1.id, containerCode, serial, stepId });

describe('rework: who may, and which drivers', () => {
  it('401 without a session, 403 for quality, 400 naming stationId / stepId', async () => {
    expect((await as().post(`/api/drivers/${serial}/rework/start`, moving())).status).toBe(401);
    expect((await as(quality).post(`/api/drivers/${serial}/rework/start`, moving())).status).toBe(403);
    const noStation = await as(assembler).post(`/api/drivers/${serial}/rework/start`, { stepId: s.steps[1].id });
    expect(noStation.status).toBe(400);
    expect(noStation.body.error.details[0].field).toBe('stationId');
    const badStep = await as(assembler).post(`/api/drivers/${serial}/rework/finish`, { stationId: s.stations.mov.id, stepId: 'step-2' });
    expect(badStep.status).toBe(400);
    expect(badStep.body.error.details[0].field).toBe('stepId');
  });

  it('409 NOT_REWORKABLE for a passed or scrapped driver; 404 for an unknown serial', async () => {
    const passed = await as(assembler).post(`/api/drivers/${s.batches.b1.serials[0]}/rework/start`, moving());
    expect(passed.status).toBe(409);
    expect(passed.body.error.code).toBe('NOT_REWORKABLE');
    const scrapped = await as(assembler).post(`/api/drivers/${s.batches.b1.serials[3]}/rework/start`, moving());
    expect(scrapped.status).toBe(409);
    expect((await as(assembler).post(`/api/drivers/NOPE-${s.sfx}/rework/start`, moving())).status).toBe(404);
  });

  it('finishing a rework that was never started is refused and leaves the driver failed', async () => {
    const res = await as(assembler).post(`/api/drivers/${serial}/rework/finish`, moving());
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('STEP_NOT_STARTED');
    expect(await statusOf(serial)).toBe('failed');
  });
});

describe('rework of a failed driver, re-test, and its genealogy', () => {
  const newCa = () => s.lots.unused.containerCodes[0];

  it('a single-unit run with its own materials: start, REWORK_IN_PROGRESS at test, finish → reworked', async () => {
    expect((await loadForRework(s.stations.mov.id, s.steps[1].id, newCa())).status).toBe(200);
    expect((await loadForRework(s.stations.mov.id, s.steps[1].id, s.lots.wire.containerCodes[0])).status).toBe(200);
    const caBefore = await remainingOf(newCa());

    const started = await as(assembler).post(`/api/drivers/${serial}/rework/start`, moving());
    expect(started.status).toBe(200);
    const start = reworkResultSchema.parse(started.body);
    expect(start.stepRun).toMatchObject({ kind: 'rework', serial, stepId: s.steps[1].id, finishedAt: null });
    expect(start.stepRun.materials.map((m) => m.containerCode)).toContain(newCa());
    expect(start.driver.status).toBe('failed');

    const early = await as(assembler).post('/api/tests', { serial, result: 'pass' });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('REWORK_IN_PROGRESS');

    const finished = await as(assembler).post(`/api/drivers/${serial}/rework/finish`, moving());
    expect(finished.status).toBe(200);
    const finish = reworkResultSchema.parse(finished.body);
    expect(finish.driver.status).toBe('reworked');
    expect(finish.stepRun.finishedAt).not.toBeNull();
    // One unit at 0.5 g per unit (the scenario's recipe): amount per unit × units.
    expect(caBefore - (await remainingOf(newCa()))).toBeCloseTo(0.5, 3);
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityType, 'driver'), eq(auditLog.entityId, finish.driver.id), eq(auditLog.action, 'driver.status')));
    expect(audit.map((a) => [a.before, a.after])).toContainEqual([{ status: 'failed' }, { status: 'reworked' }]);
  });

  it('a reworked driver not yet re-tested may have another step redone (a rebuild is several steps)', async () => {
    expect((await loadForRework(s.stations.cap.id, s.steps[2].id, s.lots.cap.containerCodes[0])).status).toBe(200);
    const body = { stationId: s.stations.cap.id, stepId: s.steps[2].id };
    expect((await as(assembler).post(`/api/drivers/${serial}/rework/start`, body)).status).toBe(200);
    const done = await as(assembler).post(`/api/drivers/${serial}/rework/finish`, body);
    expect(done.status).toBe(200);
    expect(done.body.driver.status).toBe('reworked');
  });

  it('the backward trace carries the original build and both rework runs; the new lot reaches only this driver', async () => {
    const trace = driverTraceSchema.parse((await as(quality).get(`/api/drivers/${serial}/trace`)).body);
    expect(trace.steps.map((x) => [x.seq, x.kind])).toEqual([
      [1, 'build'],
      [2, 'build'],
      [3, 'build'],
      [2, 'rework'],
      [3, 'rework'],
    ]);
    expect(trace.steps[3].materials.map((m) => m.lotId).sort()).toEqual([s.lots.unused.id, s.lots.wire.id].sort());
    expect(trace.steps[1].materials.map((m) => m.lotId)).toContain(s.lots.ca1.id);

    const forward = lotTraceSchema.parse((await as(quality).get(`/api/lots/${s.lots.unused.id}/trace`)).body);
    expect(forward.drivers).toEqual([{ serial, status: 'reworked', batchId: s.batches.b1.id }]);
    expect(forward.counts).toMatchObject({ total: 1, reworked: 1 });
  });

  it('re-test pass → passed, keeping the whole history; then no more rework', async () => {
    const res = await as(assembler).post('/api/tests', { serial, result: 'pass' });
    expect(res.status).toBe(201);
    expect(res.body.driver).toMatchObject({ status: 'passed', previousStatus: 'reworked' });
    const detail = driverDetailSchema.parse((await as(quality).get(`/api/drivers/${serial}`)).body);
    expect(detail.tests.map((t) => t.result)).toEqual(['fail', 'pass']);
    expect(detail.reworkRuns.map((r) => r.seq)).toEqual([2, 3]);
    const again = await as(assembler).post(`/api/drivers/${serial}/rework/start`, moving());
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('NOT_REWORKABLE');
  });
});

describe('POST /api/drivers/:serial/scrap', () => {
  it('quality only, with a reason; then the driver can be neither tested nor reworked', async () => {
    const sn = s.batches.b1.serials[2];
    expect((await as().post(`/api/drivers/${sn}/scrap`, { reason: 'Cone torn at rebuild' })).status).toBe(401);
    expect((await as(assembler).post(`/api/drivers/${sn}/scrap`, { reason: 'Cone torn at rebuild' })).status).toBe(403);
    const short = await as(quality).post(`/api/drivers/${sn}/scrap`, { reason: 'no' });
    expect(short.status).toBe(400);
    expect(short.body.error.details[0].field).toBe('reason');
    expect((await as(quality).post(`/api/drivers/NOPE-${s.sfx}/scrap`, { reason: 'Cone torn at rebuild' })).status).toBe(404);

    const res = await as(quality).post(`/api/drivers/${sn}/scrap`, { reason: 'Cone torn at rebuild' });
    expect(res.status).toBe(200);
    expect(res.body.driver.status).toBe('scrapped');
    const [entry] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, res.body.driver.id), eq(auditLog.action, 'driver.scrap')));
    expect(entry).toMatchObject({ reason: 'Cone torn at rebuild', before: { status: 'passed' }, after: { status: 'scrapped' } });

    expect((await as(quality).post(`/api/drivers/${sn}/scrap`, { reason: 'Cone torn at rebuild' })).body.error.code).toBe(
      'ALREADY_SCRAPPED',
    );
    expect((await as(quality).post('/api/tests', { serial: sn, result: 'pass' })).body.error.code).toBe('DRIVER_SCRAPPED');
    expect((await as(assembler).post(`/api/drivers/${sn}/rework/start`, moving())).body.error.code).toBe('NOT_REWORKABLE');
  });
});
