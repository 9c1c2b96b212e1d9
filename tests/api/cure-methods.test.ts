import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { alerts, deviations, readings } from '../../server/db/schema';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createModel,
  createReading,
  createStation,
  createStationReading,
  createStepRun,
  hoursAgo,
  sfx,
} from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
let quality: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler, quality] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler']), ensureUser(['quality'])]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const fields = (res: { body: { error: { details: { field: string }[] } } }) => res.body.error.details.map((d) => d.field);
const iso = (msFromNow: number) => new Date(Date.now() + msFromNow).toISOString();

const base = () => ({ code: `CM-${sfx()}`, name: `Cure method test ${sfx()}`, kind: 'adhesive', unit: 'g' });
const ambient = { refTempC: 23, handlingMinutes: 60, fullCureMinutes: 1440 };

describe('cure methods: material validation', () => {
  it('400 naming the field: heat needs a schedule, uv a dose, rhMin below rhMax, fields only for their method', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ ...ambient, method: 'heat' }, 'cure.schedule'],
      [{ ...ambient, method: 'heat', schedule: [] }, 'cure.schedule'],
      [{ ...ambient, method: 'heat', schedule: [{ tempC: 120, minutes: 0 }] }, 'cure.schedule.0.minutes'],
      [
        {
          ...ambient,
          method: 'heat',
          schedule: [
            { tempC: 120, minutes: 30 },
            { tempC: 120, minutes: 20 },
          ],
        },
        'cure.schedule.1.tempC',
      ],
      [{ ...ambient, method: 'uv' }, 'cure.uvDoseMJcm2'],
      [{ ...ambient, method: 'uv', uvDoseMJcm2: -5 }, 'cure.uvDoseMJcm2'],
      [{ ...ambient, uvDoseMJcm2: 3000 }, 'cure.uvDoseMJcm2'],
      [{ ...ambient, schedule: [{ tempC: 120, minutes: 30 }] }, 'cure.schedule'],
      [{ ...ambient, method: 'heat', schedule: [{ tempC: 120, minutes: 30 }], minTempC: 10 }, 'cure.minTempC'],
      [{ ...ambient, rhMinPct: 60, rhMaxPct: 40 }, 'cure.rhMaxPct'],
      [{ ...ambient, rhMinPct: 101 }, 'cure.rhMinPct'],
      [{ ...ambient, method: 'microwave' }, 'cure.method'],
    ];
    for (const [cure, field] of cases) {
      const res = await as(admin).post('/api/materials', { ...base(), cure });
      expect(res.status, JSON.stringify(cure)).toBe(400);
      expect(fields(res), JSON.stringify(cure)).toEqual([field]);
    }
  });

  it('keeps each method: ambient by default, ambient with a minimum, heat schedule, uv dose, humidity window', async () => {
    const plain = await as(admin).post('/api/materials', { ...base(), cure: ambient });
    expect(plain.status).toBe(201);
    expect(plain.body.cure).toMatchObject({ method: 'ambient' });
    const heat = {
      ...ambient,
      method: 'heat',
      schedule: [
        { tempC: 120, minutes: 30 },
        { tempC: 150, minutes: 15 },
      ],
    };
    const h = await as(admin).post('/api/materials', { ...base(), cure: heat });
    expect(h.status).toBe(201);
    expect(h.body.cure).toMatchObject(heat);
    const uv = await as(admin).post('/api/materials', { ...base(), cure: { ...ambient, method: 'uv', uvDoseMJcm2: 3000 } });
    expect(uv.status).toBe(201);
    expect(uv.body.cure).toMatchObject({ method: 'uv', uvDoseMJcm2: 3000 });
    const ca = await as(admin).post('/api/materials', { ...base(), cure: { ...ambient, minTempC: 10, rhMinPct: 40, rhMaxPct: 60 } });
    expect(ca.status).toBe(201);
    expect(ca.body.cure).toMatchObject({ method: 'ambient', minTempC: 10, rhMinPct: 40, rhMaxPct: 60 });
  });
});

describe('cure methods: stations and their own readings', () => {
  it('a station has a cure environment (area by default, own for an oven); a bad one is 400', async () => {
    const s = sfx();
    const def = await as(admin).post('/api/stations', { code: `ST-A-${s}`, name: 'Bench', kind: 'bench', area: 'Line A' });
    expect(def.status).toBe(201);
    expect(def.body.cureEnvironment).toBe('area');
    const oven = await as(admin).post('/api/stations', {
      code: `ST-O-${s}`,
      name: 'Oven',
      kind: 'oven',
      area: 'Line A',
      cureEnvironment: 'own',
    });
    expect(oven.status).toBe(201);
    expect(oven.body.cureEnvironment).toBe('own');
    const bad = await as(admin).post('/api/stations', { code: `ST-X-${s}`, name: 'X', kind: 'x', area: 'Line A', cureEnvironment: 'oven' });
    expect(bad.status).toBe(400);
    expect(fields(bad)).toEqual(['cureEnvironment']);
    const patched = await as(admin).patch(`/api/stations/${def.body.id}`, { cureEnvironment: 'own' });
    expect(patched.status).toBe(200);
    expect(patched.body.cureEnvironment).toBe('own');
  });

  it('readings: stationId in place of area (oven up to 400 °C), irradiance for a UV lamp; exactly one of area and station', async () => {
    const oven = await createStation({ cureEnvironment: 'own' });
    const at = iso(-60_000);
    const hot = await as(assembler).post('/api/readings', { stationId: oven.id, at, tempC: 150 });
    expect(hot.status).toBe(201);
    expect(hot.body).toMatchObject({ stationId: oven.id, area: null, tempC: 150, irradianceMWcm2: null });
    const lamp = await as(assembler).post('/api/readings', { stationId: oven.id, at, irradianceMWcm2: 95.5 });
    expect(lamp.status).toBe(201);
    expect(lamp.body).toMatchObject({ stationId: oven.id, tempC: null, irradianceMWcm2: 95.5 });

    expect(fields(await as(assembler).post('/api/readings', { area: 'Line A', stationId: oven.id, at, tempC: 20 }))).toEqual(['stationId']);
    expect(fields(await as(assembler).post('/api/readings', { at, tempC: 20 }))).toEqual(['area']);
    expect(fields(await as(assembler).post('/api/readings', { area: 'Line A', at, tempC: 151 }))).toEqual(['tempC']);
    expect(fields(await as(assembler).post('/api/readings', { area: 'Line A', at, irradianceMWcm2: 80 }))).toEqual([
      'tempC',
      'irradianceMWcm2',
    ]);
    expect(fields(await as(assembler).post('/api/readings', { stationId: oven.id, at }))).toEqual(['tempC']);
    expect(fields(await as(assembler).post('/api/readings', { stationId: oven.id, at, irradianceMWcm2: -1 }))).toEqual(['irradianceMWcm2']);
    expect(await db.select().from(readings).where(eq(readings.stationId, oven.id))).toHaveLength(2);
    const listed = await as(assembler).get(`/api/readings?stationId=${oven.id}`);
    expect(listed.status).toBe(200);
    expect(listed.body.items).toHaveLength(2);
    // Only the radiometer readings (what the station screen asks for a UV step's dose).
    const lampOnly = await as(assembler).get(`/api/readings?stationId=${oven.id}&measure=irradiance`);
    expect(lampOnly.body.items.map((r: { irradianceMWcm2: number }) => r.irradianceMWcm2)).toEqual([95.5]);
    expect(fields(await as(assembler).get(`/api/readings?stationId=${oven.id}&measure=light`))).toEqual(['query.measure']);
  });

  it('readings: an unknown stationId is a 400 naming the field (alone or in a list), and nothing is recorded', async () => {
    const oven = await createStation({ cureEnvironment: 'own' });
    const at = iso(-60_000);
    const unknown = '00000000-0000-4000-8000-00000000abcd';
    const one = await as(assembler).post('/api/readings', { stationId: unknown, at, tempC: 150 });
    expect(one.status).toBe(400);
    expect(fields(one)).toEqual(['stationId']);
    expect(one.body.error.message).toContain('not a station');
    const many = await as(assembler).post('/api/readings', {
      readings: [
        { stationId: oven.id, at, tempC: 149 },
        { stationId: unknown, at, irradianceMWcm2: 90 },
      ],
    });
    expect(many.status).toBe(400);
    expect(fields(many)).toEqual(['readings.1.stationId']);
    expect(await db.select().from(readings).where(eq(readings.stationId, oven.id))).toHaveLength(0);
  });
});

const HOUR = 3_600_000;
const MIN = 60_000;
/** Heat-cure magnet-bond epoxy: 30 min at 120 °C, 15 min at 150 °C (a worked data-sheet style schedule). */
const heatCure = {
  method: 'heat' as const,
  refTempC: 120,
  handlingMinutes: 30,
  fullCureMinutes: 30,
  schedule: [
    { tempC: 120, minutes: 30 },
    { tempC: 150, minutes: 15 },
  ],
};

describe('cure methods: POST /api/cure/estimate', () => {
  it('heat: 135 °C between 30 min at 120 °C and 15 min at 150 °C is √(30 × 15) = 21.2 min (log-linear interpolation)', async () => {
    const m = await createMaterial({ name: 'Heat-cure epoxy', cure: heatCure });
    const startAt = '2026-03-04T08:00:00.000Z';
    const res = await as(assembler).post('/api/cure/estimate', { materialId: m.id, startAt, tempC: 135 });
    expect(res.status).toBe(200);
    expect(res.body.cureMethod).toBe('heat');
    expect(res.body.fullCureMinutes).toBeCloseTo(Math.sqrt(30 * 15), 3); // times are whole milliseconds
  });

  it('ambient with a minimum: 2 h at 5 °C (below 10 °C) add nothing, then 24 h at the 25 °C reference', async () => {
    const m = await createMaterial({
      name: 'Cold-sensitive adhesive',
      cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440, minTempC: 10 },
    });
    const t0 = Date.parse('2026-03-04T08:00:00.000Z');
    const readings = [
      { at: new Date(t0).toISOString(), tempC: 5 },
      { at: new Date(t0 + 2 * HOUR).toISOString(), tempC: 25 },
    ];
    const res = await as(assembler).post('/api/cure/estimate', { materialId: m.id, startAt: new Date(t0).toISOString(), readings });
    expect(res.status).toBe(200);
    expect(Date.parse(res.body.fullCureAt) - t0).toBe(26 * HOUR);
    expect(res.body.minutesBelowMin).toBe(120);
    const cold = await as(assembler).post('/api/cure/estimate', { materialId: m.id, startAt: new Date(t0).toISOString(), tempC: 5 });
    expect(cold.body).toMatchObject({ fullCureAt: null, handlingAt: null });
  });

  it('uv: 3,000 mJ/cm² at 100 mW/cm² needs 30 s (dose = irradiance × time, 1 mW·s = 1 mJ)', async () => {
    const m = await createMaterial({
      name: 'UV acrylic',
      cure: { method: 'uv', refTempC: 23, handlingMinutes: 1, fullCureMinutes: 1, uvDoseMJcm2: 3000 },
    });
    const res = await as(assembler).post('/api/cure/estimate', { materialId: m.id, irradianceMWcm2: 100 });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ cureMethod: 'uv', exposureSeconds: 30, doseMJcm2: 3000, irradianceMWcm2: 100 });
    const noIrr = await as(assembler).post('/api/cure/estimate', { materialId: m.id, startAt: '2026-03-04T08:00:00.000Z', tempC: 25 });
    expect(noIrr.status).toBe(400);
    expect(fields(noIrr)).toEqual(['irradianceMWcm2']);
  });
});

describe("cure methods: the oven gate uses the station's own readings", () => {
  async function ovenRun(ovenTempC: number) {
    const area = `area-${sfx()}`;
    const ovenKind = `oven ${sfx()}`;
    const nextKind = `magnetize ${sfx()}`;
    const oven = await createStation({ kind: ovenKind, area, cureEnvironment: 'own' });
    const next = await createStation({ kind: nextKind, area });
    const epoxy = await createMaterial({ name: 'Magnet-bond epoxy', cure: heatCure });
    const model = await createModel({
      steps: [
        { name: 'Magnet bond (oven)', stationKind: ovenKind, waitForCure: true, materials: [{ materialId: epoxy.id, amountPerUnit: 1 }] },
        { name: 'Magnetize', stationKind: nextKind },
      ],
    });
    const batch = await createBatch({ modelId: model.id, quantity: 2, status: 'in_process' });
    const lot = await createLot({ materialId: epoxy.id, containerStatus: 'open', openedAt: hoursAgo(2) });
    const finishedAt = new Date(Date.now() - 20 * MIN);
    // The area's air is 25 °C: by the area the epoxy would need hours (30 min × 2^9.5 ≈ 12 h).
    await createReading(area, new Date(finishedAt.getTime() - 5 * MIN), 25);
    await createStationReading(oven.id, new Date(finishedAt.getTime() - 5 * MIN), { tempC: ovenTempC });
    await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: oven.id,
      finishedAt,
      cureCompleteAt: new Date(finishedAt.getTime() + 15 * MIN),
      used: [{ containerId: lot.containers[0].id, quantity: 2 }],
    });
    return { batch, model, next, finishedAt };
  }
  const startNext = (o: Awaited<ReturnType<typeof ovenRun>>) =>
    as(assembler).post(`/api/batches/${o.batch.id}/steps/${o.model.steps[1].id}/start`, { stationId: o.next.id });

  it('oven at 150 °C: 15 min to full cure, so 20 min after the finish the next step may start (the area at 25 °C would refuse)', async () => {
    const o = await ovenRun(150);
    const res = await startNext(o);
    expect(res.status).toBe(200);
    expect(res.body.stepRun.shortCure).toBe(false);
  });

  it('oven at 100 °C: below the schedule, ×2 per 10 °C (common practice) from 30 min at 120 °C gives 120 min → CURE_INCOMPLETE', async () => {
    const o = await ovenRun(100);
    const res = await startNext(o);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CURE_INCOMPLETE');
    expect(Date.parse(res.body.error.details.cureCompleteAt)).toBe(o.finishedAt.getTime() + 120 * MIN);
  });
});

describe('cure methods: a UV step is finished by its dose', () => {
  /** A UV station with a lamp measured at 80 mW/cm², a dust-cap acrylic needing 3,000 mJ/cm², a batch started there. */
  async function uvStarted() {
    const uvKind = `uv cap ${sfx()}`;
    const lampStation = await createStation({ kind: uvKind, cureEnvironment: 'own' });
    const acrylic = await createMaterial({
      name: 'UV dust-cap acrylic',
      cure: { method: 'uv', refTempC: 23, handlingMinutes: 1, fullCureMinutes: 1, uvDoseMJcm2: 3000 },
    });
    const model = await createModel({
      steps: [{ name: 'Dust cap (UV)', stationKind: uvKind, materials: [{ materialId: acrylic.id, amountPerUnit: 0.2 }] }],
    });
    const batch = await createBatch({ modelId: model.id, quantity: 2 });
    const lot = await createLot({ materialId: acrylic.id, quantity: 50 });
    await createStationReading(lampStation.id, new Date(Date.now() - HOUR), { irradianceMWcm2: 80 });
    expect(
      (await as(assembler).post(`/api/stations/${lampStation.id}/load`, { batchId: batch.id, containerCode: lot.containers[0].code }))
        .status,
    ).toBe(200);
    const url = `/api/batches/${batch.id}/steps/${model.steps[0].id}`;
    expect((await as(assembler).post(`${url}/start`, { stationId: lampStation.id })).status).toBe(200);
    const finish = (extra: Record<string, unknown>) => as(assembler).post(`${url}/finish`, { stationId: lampStation.id, ...extra });
    return { lampStation, batch, model, finish };
  }

  it('needs the exposure; 80 mW/cm² × 30 s = 2,400 mJ/cm² < 3,000 → 409 UV_DOSE_LOW naming both; 40 s = 3,200 finishes', async () => {
    const u = await uvStarted();
    const none = await u.finish({});
    expect(none.status).toBe(400);
    expect(fields(none)).toEqual(['exposureSeconds']);
    const low = await u.finish({ exposureSeconds: 30 });
    expect(low.status).toBe(409);
    expect(low.body.error.code).toBe('UV_DOSE_LOW');
    expect(low.body.error.message).toContain('2,400 mJ/cm²');
    expect(low.body.error.message).toContain('3,000 mJ/cm²');
    expect(low.body.error.details).toMatchObject({ doseMJcm2: 2400, neededMJcm2: 3000, irradianceMWcm2: 80, exposureSeconds: 30 });
    const ok = await u.finish({ exposureSeconds: 40 });
    expect(ok.status).toBe(200);
    expect(ok.body.stepRun.finishedAt).not.toBeNull();
    // The run keeps the figures (dose = irradiance × time: 80 mW/cm² × 40 s = 3,200 mJ/cm²), and the traveler shows them.
    expect(ok.body.stepRun.uv).toEqual({ exposureSeconds: 40, irradianceMWcm2: 80, doseMJcm2: 3200, neededMJcm2: 3000 });
    const traveler = await as(assembler).get(`/api/batches/${u.batch.id}`);
    const step = traveler.body.steps[0];
    expect(step.cure).toMatchObject({ method: 'uv', uvDoseMJcm2: 3000 });
    expect(step.materials[0].cureMethod).toBe('uv');
    expect(step.run.uv).toMatchObject({ doseMJcm2: 3200, neededMJcm2: 3000 });
    expect(step.humidity).toBeNull();
  });

  it('a quality deviation (uv_dose_low) lets a short dose finish, once', async () => {
    const u = await uvStarted();
    expect((await u.finish({ exposureSeconds: 30 })).body.error.code).toBe('UV_DOSE_LOW');
    const dev = await as(quality).post('/api/deviations', {
      batchId: u.batch.id,
      stepId: u.model.steps[0].id,
      kind: 'uv_dose_low',
      reason: 'Cap bond verified by pull test on 3 units',
    });
    expect(dev.status).toBe(201);
    const ok = await u.finish({ exposureSeconds: 30 });
    expect(ok.status).toBe(200);
    const [used] = await db.select().from(deviations).where(eq(deviations.id, dev.body.deviation.id));
    expect(used.usedAt).not.toBeNull();
  });
});

describe('cure methods: radiometer check due', () => {
  it("raises lamp_check_due when a UV lamp's last radiometer reading is older than 7 days, and resolves it after a new one", async () => {
    const lampStation = await createStation({ kind: `uv ${sfx()}`, cureEnvironment: 'own' });
    await createStationReading(lampStation.id, new Date(Date.now() - 8 * 24 * HOUR), { irradianceMWcm2: 90 });
    expect((await as(quality).post('/api/compliance/run', {})).status).toBe(200);
    let rows = await db.select().from(alerts).where(eq(alerts.subjectId, lampStation.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ kind: 'lamp_check_due', subjectType: 'station', state: 'open' });
    expect(rows[0].message).toContain(lampStation.code);

    await createStationReading(lampStation.id, new Date(Date.now() - HOUR), { irradianceMWcm2: 88 });
    await as(quality).post('/api/compliance/run', {});
    rows = await db.select().from(alerts).where(eq(alerts.subjectId, lampStation.id));
    expect(rows[0].state).toBe('resolved');
  });

  it('a lamp read 6 days ago raises nothing', async () => {
    const lampStation = await createStation({ kind: `uv ${sfx()}`, cureEnvironment: 'own' });
    await createStationReading(lampStation.id, new Date(Date.now() - 6 * 24 * HOUR), { irradianceMWcm2: 90 });
    await as(quality).post('/api/compliance/run', {});
    expect(await db.select().from(alerts).where(eq(alerts.subjectId, lampStation.id))).toHaveLength(0);
  });
});

describe('cure methods: humidity window', () => {
  it("flags a cure that ran while the area's RH left the material's window (40–60 % RH), not one that stayed inside", async () => {
    const area = `area-${sfx()}`;
    const kind = `ca bond ${sfx()}`;
    const st = await createStation({ kind, area });
    const ca = await createMaterial({
      name: 'Cyanoacrylate',
      cure: { refTempC: 23, handlingMinutes: 1, fullCureMinutes: 1440, rhMinPct: 40, rhMaxPct: 60 },
    });
    const model = await createModel({
      steps: [{ name: 'Lead-wire tack', stationKind: kind, materials: [{ materialId: ca.id, amountPerUnit: 0.05 }] }],
    });
    const run = async () => {
      const batch = await createBatch({ modelId: model.id, status: 'in_process' });
      const lot = await createLot({ materialId: ca.id, containerStatus: 'open', openedAt: hoursAgo(5) });
      return createStepRun({
        batchId: batch.id,
        stepId: model.steps[0].id,
        stationId: st.id,
        finishedAt: hoursAgo(3),
        cureCompleteAt: new Date(Date.now() + 20 * HOUR),
        used: [{ containerId: lot.containers[0].id, quantity: 0.1 }],
      });
    };
    const inside = await run();
    await createReading(area, hoursAgo(4), 23, 50);
    await as(quality).post('/api/compliance/run', {});
    expect(await db.select().from(alerts).where(eq(alerts.subjectId, inside.id))).toHaveLength(0);
    const travelerStep = async () => (await as(assembler).get(`/api/batches/${inside.batchId}`)).body.steps[0];
    const before = await travelerStep();
    expect(before.cure).toMatchObject({ method: 'ambient', rhMinPct: 40, rhMaxPct: 60 });
    expect(before.humidity).toMatchObject({ rhMinPct: 40, rhMaxPct: 60, area, outside: [] });

    // 1 h ago the area dropped to 30 % RH: below the window (the cure is still running).
    await createReading(area, hoursAgo(1), 23, 30);
    await as(quality).post('/api/compliance/run', {});
    const [flag] = await db.select().from(alerts).where(eq(alerts.subjectId, inside.id));
    expect(flag).toMatchObject({ kind: 'humidity_out_of_window', subjectType: 'step_run', state: 'open' });
    expect(flag.message).toContain('30 % RH');
    expect(flag.message).toContain('40–60 % RH');
    // The batch page shows the same flag, computed from the readings (not from the alert).
    const after = await travelerStep();
    expect(after.humidity.outside).toHaveLength(1);
    expect(after.humidity.outside[0]).toMatchObject({ rhPct: 30 });
  });
});
