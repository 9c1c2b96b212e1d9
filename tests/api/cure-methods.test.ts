import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { readings } from '../../server/db/schema';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createStation, sfx } from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
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
      [{ ...ambient, method: 'heat', schedule: [{ tempC: 120, minutes: 30 }, { tempC: 120, minutes: 20 }] }, 'cure.schedule.1.tempC'],
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
    const heat = { ...ambient, method: 'heat', schedule: [{ tempC: 120, minutes: 30 }, { tempC: 150, minutes: 15 }] };
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
    const oven = await as(admin).post('/api/stations', { code: `ST-O-${s}`, name: 'Oven', kind: 'oven', area: 'Line A', cureEnvironment: 'own' });
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
    expect(fields(await as(assembler).post('/api/readings', { area: 'Line A', at, irradianceMWcm2: 80 }))).toEqual(['tempC', 'irradianceMWcm2']);
    expect(fields(await as(assembler).post('/api/readings', { stationId: oven.id, at }))).toEqual(['tempC']);
    expect(fields(await as(assembler).post('/api/readings', { stationId: oven.id, at, irradianceMWcm2: -1 }))).toEqual(['irradianceMWcm2']);
    expect(await db.select().from(readings).where(eq(readings.stationId, oven.id))).toHaveLength(2);
    const listed = await as(assembler).get(`/api/readings?stationId=${oven.id}`);
    expect(listed.status).toBe(200);
    expect(listed.body.items).toHaveLength(2);
  });
});
