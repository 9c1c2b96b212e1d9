/**
 * Races, each with at least 30 requests in flight at once: unique codes and names, renames to one
 * name, loading one mix or container, spending the last stock, and Idempotency-Key replays.
 * The database enforces what must hold; the answers are 2xx or a 4xx with a code, never a 5xx.
 */
import { and, eq, isNull, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db, pool } from '../../server/db/client';
import { containers, materials, mixes, stationLoads, stations, suppliers } from '../../server/db/schema';
import { api, startApp, type ApiResponse, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMix,
  createModel,
  createStation,
  createSupplier,
  createTwoPart,
  minutesAgo,
  sfx,
} from '../helpers/fixtures';

const N = 30;

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

function tally(results: ApiResponse[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const r of results) {
    const key = r.status < 300 ? String(r.status) : `${r.status} ${r.body?.error?.code ?? ''}`;
    out[key] = (out[key] ?? 0) + 1;
  }
  return out;
}

function expectNo5xx(results: ApiResponse[]): void {
  expect(
    results.filter((r) => r.status >= 500).map((r) => r.body),
    JSON.stringify(tally(results)),
  ).toEqual([]);
}

describe('unique races are 409 naming the field, never 500', () => {
  it(`${N} parallel POST /api/materials with one code make one material; the rest are 409 DUPLICATE_CODE on "code"`, async () => {
    const code = `RACE-${sfx()}`;
    const results = await Promise.all(
      Array.from({ length: N }, (_, i) =>
        as(admin).post('/api/materials', { code, name: `Race adhesive ${i}`, kind: 'adhesive', unit: 'g' }),
      ),
    );
    expectNo5xx(results);
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    const refused = results.filter((r) => r.status !== 201);
    expect(refused.every((r) => r.status === 409 && r.body.error.code === 'DUPLICATE_CODE')).toBe(true);
    expect(refused.every((r) => r.body.error.details[0].field === 'code')).toBe(true);
    expect(await db.select().from(materials).where(eq(materials.code, code))).toHaveLength(1);
  });

  it(`${N} suppliers renamed to one name at once: one wins, the rest are 409 DUPLICATE_NAME on "name"`, async () => {
    const rows = await Promise.all(Array.from({ length: N }, () => createSupplier('Race supply')));
    const name = `Shared name ${sfx()}`;
    const results = await Promise.all(rows.map((s) => as(admin).patch(`/api/suppliers/${s.id}`, { name })));
    expectNo5xx(results);
    expect(results.filter((r) => r.status === 200)).toHaveLength(1);
    expect(
      results
        .filter((r) => r.status === 409)
        .every((r) => r.body.error.code === 'DUPLICATE_NAME' && r.body.error.details[0].field === 'name'),
    ).toBe(true);
    expect(
      await db
        .select()
        .from(suppliers)
        .where(sql`lower(${suppliers.name}) = ${name.toLowerCase()}`),
    ).toHaveLength(1);
  });

  it(`${N} stations and ${N} materials given one code at once: one each, the rest 409 DUPLICATE_CODE on "code"`, async () => {
    const sts = await Promise.all(Array.from({ length: N }, () => createStation()));
    const stationCode = `ST-RACE-${sfx()}`;
    const stationResults = await Promise.all(sts.map((s) => as(admin).patch(`/api/stations/${s.id}`, { code: stationCode })));
    expectNo5xx(stationResults);
    expect(stationResults.filter((r) => r.status === 200)).toHaveLength(1);
    expect(stationResults.filter((r) => r.status === 409).every((r) => r.body.error.details[0].field === 'code')).toBe(true);
    expect(await db.select().from(stations).where(eq(stations.code, stationCode))).toHaveLength(1);

    const mats = await Promise.all(
      Array.from({ length: N }, (_, i) =>
        as(admin).post('/api/materials', { code: `RM-${sfx()}-${i}`, name: `Rename me ${i}`, kind: 'wire', unit: 'm' }),
      ),
    );
    const materialCode = `MAT-RACE-${sfx()}`;
    const materialResults = await Promise.all(mats.map((m) => as(admin).patch(`/api/materials/${m.body.id}`, { code: materialCode })));
    expectNo5xx(materialResults);
    expect(materialResults.filter((r) => r.status === 200)).toHaveLength(1);
    expect(
      materialResults
        .filter((r) => r.status === 409)
        .every((r) => r.body.error.code === 'DUPLICATE_CODE' && r.body.error.details[0].field === 'code'),
    ).toBe(true);
    expect(await db.select().from(materials).where(eq(materials.code, materialCode))).toHaveLength(1);
  });
});

describe('loading one thing many times at once', () => {
  async function setup() {
    const { epoxy, station, batch } = await gluingStep('pot', 'Glue magnet');
    const r = await createLot({ materialId: epoxy.resin.id, quantity: 200 });
    const h = await createLot({ materialId: epoxy.hardener.id, quantity: 100 });
    return { station, batch, resin: r.containers[0], hardener: h.containers[0] };
  }

  it(`${N + 20} parallel loads of one mix for one batch at one station leave exactly one active load`, async () => {
    const { station, batch, resin, hardener } = await setup();
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: resin.id,
      hardenerContainerId: hardener.id,
      mixedAt: minutesAgo(1),
      potLifeEndsAt: new Date(Date.now() + 3600_000),
    });
    const results = await Promise.all(
      Array.from({ length: N + 20 }, () =>
        as(assembler).post(`/api/stations/${station.id}/load`, { batchId: batch.id, mixCode: mix.code }),
      ),
    );
    expectNo5xx(results);
    expect(results.some((r) => r.status === 200)).toBe(true);
    // Each answer is a load (new or already there) or the database's one-active-load refusal.
    expect(
      results.every((r) => r.status === 200 || (r.status === 409 && r.body.error.code === 'ALREADY_LOADED')),
      JSON.stringify(tally(results)),
    ).toBe(true);
    const active = await db
      .select()
      .from(stationLoads)
      .where(
        and(
          eq(stationLoads.stationId, station.id),
          eq(stationLoads.batchId, batch.id),
          eq(stationLoads.mixId, mix.id),
          isNull(stationLoads.unloadedAt),
        ),
      );
    expect(active).toHaveLength(1);
  });

  it(`${N} parallel loads of one sealed container open it once and leave one active load`, async () => {
    const { station, batch, resin } = await setup();
    const results = await Promise.all(
      Array.from({ length: N }, () =>
        as(assembler).post(`/api/stations/${station.id}/load`, { batchId: batch.id, containerCode: resin.code }),
      ),
    );
    expectNo5xx(results);
    expect(
      results.every((r) => r.status === 200 || (r.status === 409 && r.body.error.code === 'ALREADY_LOADED')),
      JSON.stringify(tally(results)),
    ).toBe(true);
    expect(results.filter((r) => r.status === 200 && r.body.opened === true)).toHaveLength(1);
    const active = await db
      .select()
      .from(stationLoads)
      .where(and(eq(stationLoads.stationId, station.id), eq(stationLoads.containerId, resin.id), isNull(stationLoads.unloadedAt)));
    expect(active).toHaveLength(1);
  });
});

/** A new epoxy, a station of a new kind and an open batch whose one step glues with it there. */
async function gluingStep(kind: string, stepName: string) {
  const epoxy = await createTwoPart({ potLifeMinutes: 240 });
  const station = await createStation({ kind: `${kind} ${sfx()}` });
  const model = await createModel({
    steps: [{ name: stepName, stationKind: station.kind, materials: [{ materialId: epoxy.resin.id, amountPerUnit: 1 }] }],
  });
  const batch = await createBatch({ modelId: model.id, quantity: 2 });
  return { epoxy, station, batch };
}

describe('a load checks again when its container changes in between', () => {
  it(`${N} parallel loads of one open container all get through, leaving one active load`, async () => {
    const { epoxy, station, batch } = await gluingStep('open', 'Glue spider');
    const lot = await createLot({ materialId: epoxy.resin.id, quantity: 200, containerStatus: 'open', openedAt: minutesAgo(30) });
    const code = lot.containers[0].code;
    const results = await Promise.all(
      Array.from({ length: N }, () => as(assembler).post(`/api/stations/${station.id}/load`, { batchId: batch.id, containerCode: code })),
    );
    expectNo5xx(results);
    // Each one that found the container changed checks again under its row lock: all get through.
    expect(
      results.every((r) => r.status === 200),
      JSON.stringify(tally(results)),
    ).toBe(true);
    expect(results.filter((r) => r.body.alreadyLoaded === false)).toHaveLength(1);
    expect(results.filter((r) => r.status === 200 && r.body.opened === true)).toHaveLength(0);
    const active = await db
      .select()
      .from(stationLoads)
      .where(
        and(eq(stationLoads.stationId, station.id), eq(stationLoads.containerId, lot.containers[0].id), isNull(stationLoads.unloadedAt)),
      );
    expect(active).toHaveLength(1);
  });

  it(`${N} parallel sends of one load with one Idempotency-Key load once; every answer is that load or "in progress"`, async () => {
    const { epoxy, station, batch } = await gluingStep('keyed', 'Glue coil');
    const lot = await createLot({ materialId: epoxy.resin.id, quantity: 200 });
    const key = `keyed-${sfx()}`;
    const results = await Promise.all(
      Array.from({ length: N }, () =>
        as(assembler).post(
          `/api/stations/${station.id}/load`,
          { batchId: batch.id, containerCode: lot.containers[0].code },
          { headers: { 'idempotency-key': key } },
        ),
      ),
    );
    expectNo5xx(results);
    const ok = results.filter((r) => r.status === 200);
    expect(
      results.every((r) => r.status === 200 || (r.status === 409 && r.body.error.code === 'IDEMPOTENCY_IN_PROGRESS')),
      JSON.stringify(tally(results)),
    ).toBe(true);
    expect(ok.length).toBeGreaterThan(0);
    expect(new Set(ok.map((r) => r.body.id)).size).toBe(1);
    expect(ok.every((r) => r.body.opened === true && r.body.alreadyLoaded === false)).toBe(true);
    const loads = await db.select().from(stationLoads).where(eq(stationLoads.containerId, lot.containers[0].id));
    expect(loads).toHaveLength(1);
  });

  it('a container emptied while its load waits is refused as empty, and nothing is loaded', async () => {
    const { epoxy, station, batch } = await gluingStep('empty', 'Glue cone');
    const lot = await createLot({ materialId: epoxy.resin.id, quantity: 50, containerStatus: 'open', openedAt: minutesAgo(30) });
    const container = lot.containers[0];
    // Another transaction empties the container and holds its row until it commits; the load
    // sent meanwhile reads the container as it was, then must wait, see it changed, and check again.
    const other = await pool.connect();
    try {
      await other.query('BEGIN');
      await other.query(`UPDATE containers SET status = 'empty', remaining = 0, updated_at = now() WHERE id = $1`, [container.id]);
      const pending = as(assembler).post(`/api/stations/${station.id}/load`, { batchId: batch.id, containerCode: container.code });
      await new Promise((r) => setTimeout(r, 400));
      await other.query('COMMIT');
      const res = await pending;
      expect(res.status, JSON.stringify(res.body)).toBe(409);
      expect(res.body.error.code).toBe('CONTAINER_EMPTY');
    } finally {
      other.release();
    }
    const loads = await db.select().from(stationLoads).where(eq(stationLoads.containerId, container.id));
    expect(loads).toHaveLength(0);
  });
});

describe('spending the last stock', () => {
  it(`${N} parallel mixes of 30 g from a resin container holding 100 g: exactly 3 are made, none overdraws`, async () => {
    const epoxy = await createTwoPart({ potLifeMinutes: 60 });
    const station = await createStation();
    const r = await createLot({ materialId: epoxy.resin.id, quantity: 100 });
    const h = await createLot({ materialId: epoxy.hardener.id, quantity: 1000 });
    const body = { resinCode: r.containers[0].code, hardenerCode: h.containers[0].code, resinQuantity: 30, hardenerQuantity: 15 };
    const results = await Promise.all(Array.from({ length: N }, () => as(assembler).post(`/api/stations/${station.id}/mixes`, body)));
    expectNo5xx(results);
    expect(results.filter((x) => x.status === 201)).toHaveLength(3);
    expect(
      results.filter((x) => x.status !== 201).every((x) => x.status === 409 && x.body.error.code === 'INSUFFICIENT_STOCK'),
      JSON.stringify(tally(results)),
    ).toBe(true);
    const [resin] = await db.select().from(containers).where(eq(containers.id, r.containers[0].id));
    const [hardener] = await db.select().from(containers).where(eq(containers.id, h.containers[0].id));
    // 100 − 3 × 30 = 10 g left; 1000 − 3 × 15 = 955 g.
    expect(resin.remaining).toBe('10.000');
    expect(hardener.remaining).toBe('955.000');
    expect(await db.select().from(mixes).where(eq(mixes.resinContainerId, r.containers[0].id))).toHaveLength(3);
  });
});

describe('Idempotency-Key replays in parallel', () => {
  it(`${N} parallel sends of one request with one key make one record; every answer is the first or "in progress"`, async () => {
    const key = `race-${sfx()}`;
    const name = `Idempotent supply ${key}`;
    const results = await Promise.all(
      Array.from({ length: N }, () => as(admin).post('/api/suppliers', { name }, { headers: { 'idempotency-key': key } })),
    );
    expectNo5xx(results);
    const created = results.filter((r) => r.status === 201);
    expect(created.length).toBeGreaterThanOrEqual(1);
    expect(new Set(created.map((r) => r.body.id)).size).toBe(1);
    expect(results.filter((r) => r.status !== 201).every((r) => r.status === 409 && r.body.error.code === 'IDEMPOTENCY_IN_PROGRESS')).toBe(
      true,
    );
    expect(await db.select().from(suppliers).where(eq(suppliers.name, name))).toHaveLength(1);
  });

  it(`${N} parallel sends of one key with different bodies make one record; the others are refused, none replays another body's answer`, async () => {
    const key = `race-mixed-${sfx()}`;
    const names = Array.from({ length: N }, (_, i) => `Mixed supply ${key} ${i}`);
    const results = await Promise.all(
      names.map((name) => as(admin).post('/api/suppliers', { name }, { headers: { 'idempotency-key': key } })),
    );
    expectNo5xx(results);
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    expect(
      results
        .filter((r) => r.status !== 201)
        .every(
          (r) =>
            (r.status === 422 && r.body.error.code === 'IDEMPOTENCY_KEY_REUSED') ||
            (r.status === 409 && r.body.error.code === 'IDEMPOTENCY_IN_PROGRESS'),
        ),
    ).toBe(true);
    const made = await db
      .select()
      .from(suppliers)
      .where(sql`${suppliers.name} LIKE ${`Mixed supply ${key} %`}`);
    expect(made).toHaveLength(1);
  });
});
