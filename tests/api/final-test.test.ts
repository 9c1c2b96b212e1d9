import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, drivers, materials, stepRuns, testResults } from '../../server/db/schema';
import { defectCodeListSchema } from '../../shared/schemas/defects';
import { driverDetailSchema } from '../../shared/schemas/drivers';
import { testCreatedSchema } from '../../shared/schemas/tests';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { buildTraceScenario, type TraceScenario } from '../helpers/trace-scenario';

let app: TestApp;
let s: TraceScenario;
let quality: TestUser;
let assembler: TestUser;
let receiving: TestUser;
let admin: TestUser;

beforeAll(async () => {
  app = await startApp();
  s = await buildTraceScenario();
  [quality, assembler, receiving, admin] = await Promise.all([
    ensureUser(['quality']),
    ensureUser(['assembler']),
    ensureUser(['receiving']),
    ensureUser(['admin']),
  ]);
});
afterAll(() => app.close());

const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const driverRow = async (serial: string) => (await db.select().from(drivers).where(eq(drivers.serial, serial)))[0];
const testCount = async (serial: string) => {
  const d = await driverRow(serial);
  return (await db.select().from(testResults).where(eq(testResults.driverId, d.id))).length;
};
/**
 * Finishes batch 2's last step (dust cap) `hoursAgo` hours ago. The cap adhesive gets a 12 h
 * full cure at 22 °C (an overnight dust-cap cure: common practice); the gate recomputes the
 * cure from the area's readings (none here: the reference temperature holds).
 */
const finishB2Cap = async (hoursAgo: number) => {
  await db
    .update(materials)
    .set({ cure: { refTempC: 22, handlingMinutes: 120, fullCureMinutes: 720 } })
    .where(eq(materials.id, s.lots.cap.materialId));
  await db
    .update(stepRuns)
    .set({ finishedAt: new Date(Date.now() - hoursAgo * 3600_000) })
    .where(and(eq(stepRuns.batchId, s.batches.b2.id), eq(stepRuns.stepId, s.steps[2].id)));
};

describe('POST /api/tests — who and what', () => {
  it('401 without a session; 403 for receiving and admin', async () => {
    const body = { serial: s.batches.b1.serials[0], result: 'pass' };
    expect((await as().post('/api/tests', body)).status).toBe(401);
    expect((await as(receiving).post('/api/tests', body)).status).toBe(403);
    expect((await as(admin).post('/api/tests', body)).status).toBe(403);
  });

  it('400 names the field: serial, result, defectCode (fail needs one, pass must not), measurements', async () => {
    const field = async (body: unknown) => {
      const res = await as(quality).post('/api/tests', body);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('VALIDATION_FAILED');
      return res.body.error.details.map((d: { field: string }) => d.field);
    };
    expect(await field({ result: 'pass' })).toContain('serial');
    expect(await field({ serial: s.batches.b2.serials[0], result: 'maybe' })).toContain('result');
    expect(await field({ serial: s.batches.b2.serials[0], result: 'fail' })).toContain('defectCode');
    expect(await field({ serial: s.batches.b2.serials[0], result: 'pass', defectCode: s.defectCodes.active })).toContain('defectCode');
    expect(await field({ serial: s.batches.b2.serials[0], result: 'pass', measurements: { fsHz: 'low' } })).toContain('measurements.fsHz');
    const broken = await as(quality).post('/api/tests', undefined, { raw: '{"serial": ' });
    expect(broken.status).toBe(400);
  });

  it('an unknown or retired defect code is a 400 on defectCode and changes nothing', async () => {
    const serial = s.batches.b1.serials[2];
    const before = await testCount(serial);
    const unknown = await as(quality).post('/api/tests', { serial, result: 'fail', defectCode: `NOPE${s.sfx}` });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0].field).toBe('defectCode');
    const retired = await as(quality).post('/api/tests', { serial, result: 'fail', defectCode: s.defectCodes.inactive });
    expect(retired.status).toBe(400);
    expect(retired.body.error.details[0].field).toBe('defectCode');
    expect(await testCount(serial)).toBe(before);
    expect((await driverRow(serial)).status).toBe('failed');
  });

  it('404 for an unknown serial', async () => {
    const res = await as(quality).post('/api/tests', { serial: `NOPE-${s.sfx}`, result: 'pass' });
    expect(res.status).toBe(404);
  });
});

describe('POST /api/tests — plant rules', () => {
  it('409 STEPS_INCOMPLETE while a recipe step is not finished for the driver (and nothing is recorded)', async () => {
    const serial = s.batches.b2.serials[0];
    const res = await as(assembler).post('/api/tests', { serial, result: 'pass' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('STEPS_INCOMPLETE');
    expect(res.body.error.details.map((d: { stepId: string }) => d.stepId)).toEqual([s.steps[2].id]);
    expect(await testCount(serial)).toBe(0);
    expect((await driverRow(serial)).status).toBe('in_process');
  });

  it('409 CURE_INCOMPLETE while the last step must still cure (dust cap overnight: common practice)', async () => {
    await finishB2Cap(6); // 6 h of a 12 h cure
    const res = await as(assembler).post('/api/tests', { serial: s.batches.b2.serials[0], result: 'pass' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CURE_INCOMPLETE');
    await finishB2Cap(13); // cured an hour ago
  });

  it('pass → 201 and the driver is passed, with measurements and the tester kept', async () => {
    const serial = s.batches.b2.serials[0];
    const res = await as(assembler).post('/api/tests', { serial, result: 'pass', measurements: { fsHz: 38.5, reOhm: 6.2 } });
    expect(res.status).toBe(201);
    const body = testCreatedSchema.parse(res.body);
    expect(body.driver).toMatchObject({ serial, status: 'passed', previousStatus: 'in_process' });
    expect(body.test).toMatchObject({ result: 'pass', defectCode: null, measurements: { fsHz: 38.5, reOhm: 6.2 }, testedBy: assembler.id });
    expect((await driverRow(serial)).status).toBe('passed');
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityType, 'test_result'), eq(auditLog.entityId, body.test.id)));
    expect(audit).toHaveLength(1);
  });

  it('fail with an active defect code → 201 and the driver is failed; the code is normalised to upper case', async () => {
    const serial = s.batches.b2.serials[1];
    const res = await as(quality).post('/api/tests', { serial, result: 'fail', defectCode: s.defectCodes.active.toLowerCase() });
    expect(res.status).toBe(201);
    expect(res.body.test.defectCode).toBe(s.defectCodes.active);
    expect(res.body.test.defectDescription).toBe('Rub and buzz heard in the sweep');
    expect((await driverRow(serial)).status).toBe('failed');
    const statusAudit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityType, 'driver'), eq(auditLog.entityId, res.body.driver.id), eq(auditLog.action, 'driver.status')));
    expect(statusAudit.map((a) => [a.before, a.after])).toEqual([[{ status: 'in_process' }, { status: 'failed' }]]);
  });

  it('409 DRIVER_SCRAPPED for a scrapped driver', async () => {
    const res = await as(quality).post('/api/tests', { serial: s.batches.b1.serials[3], result: 'pass' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('DRIVER_SCRAPPED');
  });

  it('409 REWORK_IN_PROGRESS while a rework run on the driver is open', async () => {
    const d = await driverRow(s.batches.b1.serials[2]);
    const [open] = await db
      .insert(stepRuns)
      .values({ batchId: s.batches.b1.id, stepId: s.steps[1].id, stationId: s.stations.mov.id, driverId: d.id, kind: 'rework' })
      .returning();
    const res = await as(quality).post('/api/tests', { serial: d.serial, result: 'pass' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('REWORK_IN_PROGRESS');
    await db.update(stepRuns).set({ finishedAt: new Date() }).where(eq(stepRuns.id, open.id));
  });

  it('GET /api/drivers/:serial shows batch, model, status and the whole test history', async () => {
    const res = await as(receiving).get(`/api/drivers/${s.reworkedSerial}`);
    expect(res.status).toBe(200);
    const body = driverDetailSchema.parse(res.body);
    expect(body.batch.code).toBe(s.batches.b1.code);
    expect(body.model.code).toBe(s.modelCode);
    expect(body.driver.status).toBe('passed');
    expect(body.tests.map((t) => t.result)).toEqual(['fail', 'pass']);
    expect(body.reworkRuns.map((r) => [r.seq, r.kind])).toEqual([[2, 'rework']]);
    expect((await as().get(`/api/drivers/${s.reworkedSerial}`)).status).toBe(401);
    expect((await as(receiving).get(`/api/drivers/NOPE-${s.sfx}`)).status).toBe(404);
  });
});

describe('defect codes', () => {
  it('GET lists them for any signed-in role, 401 without a session, ?active=true hides retired ones', async () => {
    expect((await as().get('/api/defect-codes')).status).toBe(401);
    const all = defectCodeListSchema.parse((await as(assembler).get('/api/defect-codes')).body);
    expect(all.items.map((c) => c.code)).toEqual(expect.arrayContaining([s.defectCodes.active, s.defectCodes.inactive]));
    const active = defectCodeListSchema.parse((await as(assembler).get('/api/defect-codes?active=true')).body);
    expect(active.items.map((c) => c.code)).toContain(s.defectCodes.active);
    expect(active.items.map((c) => c.code)).not.toContain(s.defectCodes.inactive);
    expect((await as(assembler).get('/api/defect-codes?active=maybe')).status).toBe(400);
  });

  it('POST: quality and admin may add; assembler 403; duplicate 409; bad code 400', async () => {
    const code = `VC${s.sfx}`;
    expect((await as(assembler).post('/api/defect-codes', { code, description: 'Voice coil rub' })).status).toBe(403);
    const made = await as(quality).post('/api/defect-codes', { code: code.toLowerCase(), description: 'Voice coil rub' });
    expect(made.status).toBe(201);
    expect(made.body).toEqual({ code, description: 'Voice coil rub', active: true });
    const dup = await as(admin).post('/api/defect-codes', { code, description: 'Again' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('DUPLICATE');
    const bad = await as(admin).post('/api/defect-codes', { code: 'has space', description: 'Nope nope' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('code');
    expect((await as(admin).post('/api/defect-codes', { code: `X${s.sfx}` })).body.error.details[0].field).toBe('description');
  });

  it('PATCH retires a code (then a test with it is refused) and records old and new values', async () => {
    const code = `LD${s.sfx}`;
    await as(admin).post('/api/defect-codes', { code, description: 'Lead wire open' });
    const off = await as(quality).patch(`/api/defect-codes/${code}`, { active: false });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityType, 'defect_code'), eq(auditLog.entityId, code), eq(auditLog.action, 'defect_code.update')));
    expect(audit.map((a) => [(a.before as { active: boolean }).active, (a.after as { active: boolean }).active])).toEqual([[true, false]]);
    const refused = await as(quality).post('/api/tests', { serial: s.batches.b2.serials[2], result: 'fail', defectCode: code });
    expect(refused.status).toBe(400);
    expect((await as(assembler).patch(`/api/defect-codes/${code}`, { active: true })).status).toBe(403);
    expect((await as(quality).patch(`/api/defect-codes/${code}`, {})).status).toBe(400);
    expect((await as(quality).patch(`/api/defect-codes/NONE${s.sfx}`, { active: true })).status).toBe(404);
  });
});
