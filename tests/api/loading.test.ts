import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, containers, stationLoads } from '../../server/db/schema';
import { loadResultSchema, stationLoadedSchema } from '../../shared/schemas/station-loads';
import { randomContainerCode } from '../../server/services/receiving/codes';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createMix,
  createModel,
  createStation,
  createTwoPart,
  daysAgo,
  hoursAgo,
  minutesAgo,
  sfx,
  ymd,
} from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
let receiving: TestUser;
let station: Awaited<ReturnType<typeof createStation>>;
let glue: Awaited<ReturnType<typeof createMaterial>>;
let wire: Awaited<ReturnType<typeof createMaterial>>;
let epoxy: Awaited<ReturnType<typeof createTwoPart>>;
let batchId: string;

beforeAll(async () => {
  app = await startApp();
  [assembler, receiving] = await Promise.all([ensureUser(['assembler']), ensureUser(['receiving'])]);
  station = await createStation({ kind: `glue ${sfx()}` });
  const other = await createStation({ kind: `lead ${sfx()}` });
  glue = await createMaterial({ name: 'Spider glue', shelfLifeDays: 30, openLifeHours: 8 });
  wire = await createMaterial({ name: 'Tinsel lead wire', kind: 'wire', unit: 'm' });
  epoxy = await createTwoPart({ potLifeMinutes: 30 });
  const model = await createModel({
    steps: [
      {
        name: 'Glue spider',
        stationKind: station.kind,
        materials: [
          { materialId: glue.id, amountPerUnit: 1 },
          { materialId: epoxy.resin.id, amountPerUnit: 2 },
        ],
      },
      { name: 'Leads', stationKind: other.kind, materials: [{ materialId: wire.id, amountPerUnit: 0.3 }] },
    ],
  });
  batchId = (await createBatch({ modelId: model.id, quantity: 2 })).id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const load = (body: Record<string, unknown>, stationId = station.id) =>
  as(assembler).post(`/api/stations/${stationId}/load`, { batchId, ...body });

/** A refusal: 409 with the code, a sentence, and nothing changed. */
async function refused(code: string, body: Record<string, unknown>, stationId = station.id) {
  const containerCode = body.containerCode as string | undefined;
  const before = containerCode ? (await db.select().from(containers).where(eq(containers.code, containerCode)))[0] : undefined;
  const res = await load(body, stationId);
  expect(res.status).toBe(409);
  expect(res.body.error.code).toBe(code);
  expect(res.body.error.message.length).toBeGreaterThan(20);
  if (before) {
    const after = (await db.select().from(containers).where(eq(containers.code, containerCode!)))[0];
    expect(after).toEqual(before);
    expect(await db.select().from(stationLoads).where(eq(stationLoads.containerId, before.id))).toHaveLength(0);
    expect(await db.select().from(auditLog).where(eq(auditLog.entityId, before.id))).toHaveLength(0);
  }
  return res.body.error as { code: string; message: string; details: Record<string, unknown> };
}

describe('loading at a station: access and input', () => {
  it('401, 403 for receiving, 400 naming the field, 404 for an unknown code', async () => {
    const lot = await createLot({ materialId: glue.id });
    const body = { containerCode: lot.containers[0].code };
    expect((await as().post(`/api/stations/${station.id}/load`, { batchId, ...body })).status).toBe(401);
    expect((await as(receiving).post(`/api/stations/${station.id}/load`, { batchId, ...body })).status).toBe(403);
    const none = await load({});
    expect(none.status).toBe(400);
    expect(none.body.error.details[0].field).toBe('containerCode');
    const both = await load({ containerCode: 'A', mixCode: 'B' });
    expect(both.body.error.details[0].field).toBe('mixCode');
    expect((await as(assembler).post(`/api/stations/${station.id}/load`, { containerCode: 'A' })).body.error.details[0].field).toBe(
      'batchId',
    );
    const unknown = await load({ containerCode: `NOPE-${sfx()}` });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.details[0].field).toBe('containerCode');
    expect((await as().get(`/api/stations/${station.id}/loaded`)).status).toBe(401);
    expect((await as().post(`/api/stations/${station.id}/unload`, body)).status).toBe(401);
    expect((await as(receiving).post(`/api/stations/${station.id}/unload`, body)).status).toBe(403);
    const noTarget = await as(assembler).post(`/api/stations/${station.id}/unload`, {});
    expect(noTarget.status).toBe(400);
    expect(noTarget.body.error.details[0].field).toBe('loadId');
  });
});

describe('loading: accepted', () => {
  it('opens a sealed container (after-opening life starts), lists it with its expiry, is idempotent, unloads', async () => {
    const lot = await createLot({ materialId: glue.id, receivedAt: daysAgo(1) });
    const code = lot.containers[0].code;
    const t0 = Date.now();
    const res = await load({ containerCode: code });
    expect(res.status).toBe(200);
    const result = loadResultSchema.parse(res.body);
    expect(result).toMatchObject({ accepted: true, opened: true, alreadyLoaded: false, step: { name: 'Glue spider' } });
    expect(result.container?.status).toBe('open');
    const openedAt = Date.parse(result.container!.openedAt!);
    expect(openedAt).toBeGreaterThanOrEqual(t0 - 1000);
    // Earliest of shelf life (received + 30 d) and opening + 8 h after-opening life: the latter.
    expect(result.expiryCause).toBe('open_life');
    expect(Date.parse(result.expiresAt!)).toBe(openedAt + 8 * 3_600_000);
    expect(result.material.hazards.pictograms).toEqual(['GHS07']);
    const [openAudit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, lot.containers[0].id), eq(auditLog.action, 'container.open')));
    expect(openAudit.before).toMatchObject({ status: 'sealed', openedAt: null });

    const again = loadResultSchema.parse((await load({ containerCode: code })).body);
    expect(again).toMatchObject({ alreadyLoaded: true, opened: false, id: result.id });

    const loaded = stationLoadedSchema.parse((await as(receiving).get(`/api/stations/${station.id}/loaded?batchId=${batchId}`)).body);
    expect(loaded.items.filter((i) => i.container?.code === code)).toHaveLength(1);

    expect((await as(assembler).post(`/api/stations/${station.id}/unload`, { containerCode: code })).status).toBe(200);
    const after = stationLoadedSchema.parse((await as(receiving).get(`/api/stations/${station.id}/loaded`)).body);
    expect(after.items.some((i) => i.container?.code === code)).toBe(false);
    expect((await as(assembler).post(`/api/stations/${station.id}/unload`, { containerCode: code })).status).toBe(404);
  });

  it('reads a label code typed in lower case or inside the label URL', async () => {
    const lot = await createLot({ materialId: glue.id });
    const code = randomContainerCode();
    await db.update(containers).set({ code }).where(eq(containers.id, lot.containers[0].id));
    const res = await load({ containerCode: `  ${code.toLowerCase()}\r\n` });
    expect(res.status).toBe(200);
    expect(res.body.container.code).toBe(code);
    const viaUrl = await load({ containerCode: `https://plant.example/c/${code}` });
    expect(viaUrl.body).toMatchObject({ alreadyLoaded: true, container: { code } });
  });

  it('accepts a mix within its pot life', async () => {
    const r = await createLot({ materialId: epoxy.resin.id, containerStatus: 'open', openedAt: hoursAgo(1) });
    const h = await createLot({ materialId: epoxy.hardener.id, containerStatus: 'open', openedAt: hoursAgo(1) });
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: r.containers[0].id,
      hardenerContainerId: h.containers[0].id,
      mixedAt: minutesAgo(5),
      potLifeEndsAt: new Date(Date.now() + 25 * 60_000),
    });
    const res = loadResultSchema.parse((await load({ mixCode: mix.code })).body);
    expect(res.mix?.code).toBe(mix.code);
    expect(res.expiryCause).toBe('pot_life');
    expect(res.expiresAt).toBe(mix.potLifeEndsAt.toISOString());
    // Both parts' hazards reach the station's safety panel: the resin as `material`, the hardener as `partMaterial`.
    expect(res.material.id).toBe(epoxy.resin.id);
    expect(res.partMaterial?.id).toBe(epoxy.hardener.id);
    expect(res.partMaterial?.hazards.pictograms).toEqual(epoxy.hardener.hazards.pictograms);
    // Both lots too: the station shows the resin's lot and the hardener's lot.
    expect(res.lot).toMatchObject({ id: r.id, supplierLot: r.supplierLot });
    expect(res.partLot).toMatchObject({ id: h.id, supplierLot: h.supplierLot });
    const listed = stationLoadedSchema.parse((await as(assembler).get(`/api/stations/${station.id}/loaded?batchId=${batchId}`)).body);
    expect(listed.items.find((i) => i.mix?.code === mix.code)?.partLot?.supplierLot).toBe(h.supplierLot);
  });
});

describe('loading: every refusal reason (409, nothing changes)', () => {
  it('WRONG_MATERIAL names both materials', async () => {
    const lot = await createLot({ materialId: wire.id });
    const err = await refused('WRONG_MATERIAL', { containerCode: lot.containers[0].code });
    expect(err.message).toContain(wire.name);
    expect(err.message).toContain(glue.name);
  });

  it('WRONG_STATION when the station kind runs no pending step of the batch', async () => {
    const elsewhere = await createStation({ kind: `magnetize ${sfx()}` });
    const lot = await createLot({ materialId: glue.id });
    await refused('WRONG_STATION', { containerCode: lot.containers[0].code }, elsewhere.id);
  });

  it('LOT_ON_HOLD, LOT_QUARANTINED, LOT_REJECTED', async () => {
    for (const [status, code] of [
      ['on_hold', 'LOT_ON_HOLD'],
      ['quarantined', 'LOT_QUARANTINED'],
      ['rejected', 'LOT_REJECTED'],
    ] as const) {
      const lot = await createLot({ materialId: glue.id, status });
      const err = await refused(code, { containerCode: lot.containers[0].code });
      expect(err.message).toContain(lot.supplierLot);
    }
  });

  it('EXPIRED past the supplier expiry date and past shelf life, saying which', async () => {
    const supplier = await createLot({ materialId: glue.id, expiresOn: ymd(daysAgo(2)) });
    const a = await refused('EXPIRED', { containerCode: supplier.containers[0].code });
    expect(a.details.cause).toBe('supplier_expiry');
    expect(a.message).toContain("supplier's expiry date");
    // 30-day shelf life counted from receipt (no manufacture date) 40 days ago: api.md, Material.shelfLifeDays.
    const shelf = await createLot({ materialId: glue.id, receivedAt: daysAgo(40) });
    const b = await refused('EXPIRED', { containerCode: shelf.containers[0].code });
    expect(b.details.cause).toBe('shelf_life');
    expect(b.message).toContain('shelf life');
  });

  it('OPEN_LIFE_EXCEEDED past the after-opening life', async () => {
    const lot = await createLot({ materialId: glue.id, containerStatus: 'open', openedAt: hoursAgo(9) });
    const err = await refused('OPEN_LIFE_EXCEEDED', { containerCode: lot.containers[0].code });
    expect(err.details.cause).toBe('open_life');
  });

  it('POT_LIFE_EXCEEDED for a mix past its pot life', async () => {
    const r = await createLot({ materialId: epoxy.resin.id, containerStatus: 'open', openedAt: hoursAgo(2) });
    const h = await createLot({ materialId: epoxy.hardener.id, containerStatus: 'open', openedAt: hoursAgo(2) });
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: r.containers[0].id,
      hardenerContainerId: h.containers[0].id,
      mixedAt: minutesAgo(45),
      potLifeEndsAt: minutesAgo(15),
    });
    await refused('POT_LIFE_EXCEEDED', { mixCode: mix.code });
    expect(await db.select().from(stationLoads).where(eq(stationLoads.mixId, mix.id))).toHaveLength(0);
  });

  it('CONTAINER_EMPTY and CONTAINER_SCRAPPED', async () => {
    const empty = await createLot({ materialId: glue.id, containerStatus: 'empty', remaining: 0, openedAt: hoursAgo(1) });
    await refused('CONTAINER_EMPTY', { containerCode: empty.containers[0].code });
    const scrapped = await createLot({ materialId: glue.id, containerStatus: 'scrapped' });
    await refused('CONTAINER_SCRAPPED', { containerCode: scrapped.containers[0].code });
  });

  it('STATION_RETIRED and BATCH_CLOSED', async () => {
    const retired = await createStation({ kind: station.kind, active: false });
    const lot = await createLot({ materialId: glue.id });
    await refused('STATION_RETIRED', { containerCode: lot.containers[0].code }, retired.id);
    const closed = await createBatch({
      modelId: (await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId: glue.id, amountPerUnit: 1 }] }] })).id,
      status: 'completed',
    });
    const res = await as(assembler).post(`/api/stations/${station.id}/load`, { batchId: closed.id, containerCode: lot.containers[0].code });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('BATCH_CLOSED');
    expect((await db.select().from(containers).where(eq(containers.id, lot.containers[0].id)))[0].status).toBe('sealed');
  });
});
