import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cureTimeEstimateSchema } from '../../shared/schemas/cure';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createMaterial } from '../helpers/fixtures';

const MIN = 60_000;
const HOUR = 60 * MIN;
let app: TestApp;
let purchasing: TestUser;
let epoxyId: string;
let arrheniusId: string;
let wireId: string;
const startAt = '2026-03-04T15:30:00.000Z';
const t0 = Date.parse(startAt);

beforeAll(async () => {
  app = await startApp();
  purchasing = await ensureUser(['purchasing']);
  // Full cure 24 h and handling 1 h at 25 °C; default factor 2 per 10 °C.
  epoxyId = (await createMaterial({ name: 'Slow epoxy', cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440 } })).id;
  arrheniusId = (
    await createMaterial({
      name: 'Arrhenius epoxy',
      cure: { refTempC: 20, handlingMinutes: 60, fullCureMinutes: 1440, activationEnergyKJ: 51.2 },
    })
  ).id;
  wireId = (await createMaterial({ name: 'Lead wire', kind: 'wire', unit: 'm' })).id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const estimate = async (body: unknown) => {
  const res = await as(purchasing).post('/api/cure/estimate', body);
  expect(res.status).toBe(200);
  const e = cureTimeEstimateSchema.parse(res.body);
  if (e.fullCureAt === null || e.handlingAt === null) throw new Error('expected a cure that completes');
  return { ...e, fullCureAt: e.fullCureAt, handlingAt: e.handlingAt };
};

describe('POST /api/cure/estimate', () => {
  it("24 h at 25 °C (reference) is 12 h at 35 °C and 48 h at 15 °C (adhesive makers' technical guidance; common practice)", async () => {
    const ref = await estimate({ materialId: epoxyId, startAt, tempC: 25 });
    expect(Date.parse(ref.fullCureAt) - t0).toBe(24 * HOUR);
    expect(Date.parse(ref.handlingAt) - t0).toBe(1 * HOUR);
    expect(ref).toMatchObject({ factor: 1, refTempC: 25, method: 'factor_per_10c' });

    const warm = await estimate({ materialId: epoxyId, startAt, tempC: 35 });
    expect(Date.parse(warm.fullCureAt) - t0).toBe(12 * HOUR);
    expect(Date.parse(warm.handlingAt) - t0).toBe(30 * MIN);
    expect(warm.factor).toBeCloseTo(2, 10);
    expect(warm.fullCureMinutes).toBeCloseTo(720, 6);

    const cold = await estimate({ materialId: epoxyId, startAt, tempC: 15 });
    expect(Date.parse(cold.fullCureAt) - t0).toBe(48 * HOUR);
    expect(cold.factor).toBeCloseTo(0.5, 10);
  });

  it('Arrhenius with Ea 51.2 kJ/mol doubles the rate from 20 °C to 30 °C (references: Arrhenius k = A·e^(−Ea/RT), computed)', async () => {
    const e = await estimate({ materialId: arrheniusId, startAt, tempC: 30 });
    expect(e.method).toBe('arrhenius');
    expect(e.factor).toBeCloseTo(2, 2);
    expect(e.fullCureMinutes).toBeCloseTo(720, 0);
  });

  it('integrates over readings: 4 h at 25 °C then 35 °C completes at 14 h (Σ Δt / t(T) = 1; worked: 4/24 + 10/12 = 1)', async () => {
    const e = await estimate({
      materialId: epoxyId,
      startAt,
      readings: [
        { at: startAt, tempC: 25 },
        { at: new Date(t0 + 4 * HOUR).toISOString(), tempC: 35 },
      ],
    });
    expect(Date.parse(e.fullCureAt) - t0).toBe(14 * HOUR);
    expect(Date.parse(e.handlingAt) - t0).toBe(1 * HOUR);
    expect(e.factor).toBeCloseTo(24 / 14, 10);
  });

  it('401; 400 naming the field; 400 naming materialId for a material without a cure profile; 404 unknown material', async () => {
    expect((await as().post('/api/cure/estimate', { materialId: epoxyId, startAt, tempC: 25 })).status).toBe(401);
    const none = await as(purchasing).post('/api/cure/estimate', { materialId: epoxyId, startAt });
    expect(none.status).toBe(400);
    expect(none.body.error.details[0].field).toBe('tempC');
    expect(
      (await as(purchasing).post('/api/cure/estimate', { materialId: epoxyId, startAt: '2026-03-04', tempC: 25 })).body.error.details[0]
        .field,
    ).toBe('startAt');
    expect(
      (await as(purchasing).post('/api/cure/estimate', { materialId: epoxyId, startAt, tempC: 400 })).body.error.details[0].field,
    ).toBe('tempC');
    const noProfile = await as(purchasing).post('/api/cure/estimate', { materialId: wireId, startAt, tempC: 25 });
    expect(noProfile.status).toBe(400);
    expect(noProfile.body.error.details).toEqual([{ field: 'materialId', message: expect.stringContaining('no cure profile') }]);
    expect(
      (await as(purchasing).post('/api/cure/estimate', { materialId: '00000000-0000-4000-8000-000000000000', startAt, tempC: 25 })).status,
    ).toBe(404);
  });
});
