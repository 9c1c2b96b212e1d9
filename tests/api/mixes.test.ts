import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { containers, mixes } from '../../server/db/schema';
import { mixResultSchema, mixScanResultSchema } from '../../shared/schemas/mixes';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createLot, createMaterial, createReading, createStation, createTwoPart, hoursAgo, minutesAgo } from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
let quality: TestUser;
let epoxy: Awaited<ReturnType<typeof createTwoPart>>;

beforeAll(async () => {
  app = await startApp();
  [assembler, quality] = await Promise.all([ensureUser(['assembler']), ensureUser(['quality'])]);
  // Pot life 30 min at 25 °C; rate doubles per +10 °C (the default factor).
  epoxy = await createTwoPart({ potLifeMinutes: 30, cure: { refTempC: 25, handlingMinutes: 120, fullCureMinutes: 1440 } });
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

async function parts(resinQty = 100, hardenerQty = 50) {
  const r = await createLot({ materialId: epoxy.resin.id, quantity: resinQty });
  const h = await createLot({ materialId: epoxy.hardener.id, quantity: hardenerQty });
  return {
    resinCode: r.containers[0].code,
    hardenerCode: h.containers[0].code,
    resinId: r.containers[0].id,
    hardenerId: h.containers[0].id,
  };
}
const remaining = async (id: string) => (await db.select().from(containers).where(eq(containers.id, id)))[0];

describe('two-part mixes', () => {
  it('401, 403 for quality, 400 naming the field', async () => {
    const st = await createStation();
    const p = await parts();
    const body = { resinCode: p.resinCode, hardenerCode: p.hardenerCode, resinQuantity: 20, hardenerQuantity: 10 };
    expect((await as().post(`/api/stations/${st.id}/mixes`, body)).status).toBe(401);
    expect((await as(quality).post(`/api/stations/${st.id}/mixes`, body)).status).toBe(403);
    const bad = await as(assembler).post(`/api/stations/${st.id}/mixes`, { ...body, hardenerQuantity: -1 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('hardenerQuantity');
    expect((await as(assembler).post(`/api/stations/${st.id}/mixes`, { ...body, resinCode: '' })).body.error.details[0].field).toBe(
      'resinCode',
    );
    expect((await as(assembler).post(`/api/stations/${st.id}/mixes`, { ...body, resinCode: 'NO-SUCH' })).status).toBe(404);
    expect((await remaining(p.resinId)).remaining).toBe('100.000');
  });

  it("at 35 °C the 30-minute pot life (25 °C) is 15 minutes — each +10 °C halves it (adhesive makers' technical guidance; common practice)", async () => {
    const st = await createStation();
    await createReading(st.area, minutesAgo(20), 35);
    const p = await parts();
    const t0 = Date.now();
    const res = await as(assembler).post(`/api/stations/${st.id}/mixes`, {
      resinCode: p.resinCode,
      hardenerCode: p.hardenerCode,
      resinQuantity: 20,
      hardenerQuantity: 10,
    });
    expect(res.status).toBe(201);
    const { mix, temperature } = mixResultSchema.parse(res.body);
    expect(temperature).toMatchObject({ tempC: 35, source: 'reading', potLifeMinutes: 15, referencePotLifeMinutes: 30, area: st.area });
    expect(Date.parse(mix.potLifeEndsAt) - Date.parse(mix.mixedAt)).toBe(15 * 60_000);
    expect(Date.parse(mix.mixedAt)).toBeGreaterThanOrEqual(t0 - 1000);
    expect(mix).toMatchObject({ resinQuantity: 20, hardenerQuantity: 10, remaining: 30, status: 'active', tempC: 35 });
    expect(mix.code).toMatch(/^MX-\d{6}-\d{3,}$/);
    // Deducted from both parts, which are now open.
    const r = await remaining(p.resinId);
    const h = await remaining(p.hardenerId);
    expect([r.remaining, r.status, h.remaining, h.status]).toEqual(['80.000', 'open', '40.000', 'open']);
    expect(r.openedAt).not.toBeNull();

    const got = mixResultSchema.parse((await as(quality).get(`/api/mixes/${mix.id}`)).body);
    expect(got.mix.code).toBe(mix.code);
    expect((await as(quality).get('/api/mixes/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await as().get(`/api/mixes/${mix.id}`)).status).toBe(401);
    expect((await as(quality).get('/api/mixes/not-an-id')).body.error.details[0].field).toBe('params.id');
  });

  it('without a recent reading the reference temperature is used, and says so', async () => {
    const st = await createStation();
    await createReading(st.area, hoursAgo(6), 15); // too old to stand for the temperature now
    const p = await parts();
    const res = mixResultSchema.parse(
      (
        await as(assembler).post(`/api/stations/${st.id}/mixes`, {
          resinCode: p.resinCode,
          hardenerCode: p.hardenerCode,
          resinQuantity: 2,
          hardenerQuantity: 1,
        })
      ).body,
    );
    expect(res.temperature).toMatchObject({ tempC: 25, source: 'reference', readingAt: null, potLifeMinutes: 30 });
    expect(Date.parse(res.mix.potLifeEndsAt) - Date.parse(res.mix.mixedAt)).toBe(30 * 60_000);
  });

  it('refuses parts that are not partners, an unusable part, and more than a container holds — changing nothing', async () => {
    const st = await createStation();
    const p = await parts(10, 10);
    const stranger = await createMaterial({ name: 'Unrelated hardener', kind: 'hardener' });
    const s = await createLot({ materialId: stranger.id });
    const notPartners = await as(assembler).post(`/api/stations/${st.id}/mixes`, {
      resinCode: p.resinCode,
      hardenerCode: s.containers[0].code,
      resinQuantity: 2,
      hardenerQuantity: 1,
    });
    expect(notPartners.status).toBe(409);
    expect(notPartners.body.error.code).toBe('NOT_MIX_PARTNERS');
    expect(notPartners.body.error.message).toContain(stranger.name);

    const held = await createLot({ materialId: epoxy.hardener.id, status: 'on_hold', quantity: 10 });
    const onHold = await as(assembler).post(`/api/stations/${st.id}/mixes`, {
      resinCode: p.resinCode,
      hardenerCode: held.containers[0].code,
      resinQuantity: 2,
      hardenerQuantity: 1,
    });
    expect(onHold.body.error.code).toBe('LOT_ON_HOLD');

    const tooMuch = await as(assembler).post(`/api/stations/${st.id}/mixes`, {
      resinCode: p.resinCode,
      hardenerCode: p.hardenerCode,
      resinQuantity: 12,
      hardenerQuantity: 1,
    });
    expect(tooMuch.status).toBe(409);
    expect(tooMuch.body.error.code).toBe('INSUFFICIENT_STOCK');

    for (const id of [p.resinId, p.hardenerId, held.containers[0].id]) {
      const c = await remaining(id);
      expect([c.remaining, c.status, c.openedAt]).toEqual(['10.000', 'sealed', null]);
    }
    expect(await db.select().from(mixes).where(eq(mixes.stationId, st.id))).toHaveLength(0);
  });

  it('scanning a mix code resolves the mix with its pot-life end', async () => {
    const st = await createStation();
    const p = await parts();
    const made = mixResultSchema.parse(
      (
        await as(assembler).post(`/api/stations/${st.id}/mixes`, {
          resinCode: p.resinCode,
          hardenerCode: p.hardenerCode,
          resinQuantity: 2,
          hardenerQuantity: 1,
        })
      ).body,
    );
    const res = await as(quality).post('/api/scans/resolve', { code: made.mix.code });
    expect(res.status).toBe(200);
    const scanned = mixScanResultSchema.parse(res.body);
    expect(scanned).toMatchObject({ mix: { id: made.mix.id }, expiresAt: made.mix.potLifeEndsAt, expiryCause: 'pot_life' });
  });
});
