import express from 'express';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { buildBatches, idempotencyKeys, stationLoads } from '../../server/db/schema';
import { idempotency } from '../../server/middleware/idempotency';
import { errorHandler } from '../../server/middleware/errors';
import { api, listen, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createLot, createMaterial, createModel, createStation, sfx } from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
let quality: TestUser;
let modelId: string;
beforeAll(async () => {
  app = await startApp();
  [assembler, quality] = await Promise.all([ensureUser(['assembler']), ensureUser(['quality'])]);
  const st = await createStation();
  modelId = (await createModel({ steps: [{ stationKind: st.kind }] })).id;
});
afterAll(() => app.close());
const as = (u: TestUser) => api(app.baseUrl, u.token);
const withKey = (key: string) => ({ headers: { 'idempotency-key': key } });
const batchCount = async () => (await db.select().from(buildBatches).where(eq(buildBatches.modelId, modelId))).length;

describe('Idempotency-Key', () => {
  it('a repeat returns the first response (same status and body) and changes nothing', async () => {
    const key = `k-${sfx()}`;
    const before = await batchCount();
    const first = await as(assembler).post('/api/batches', { modelId, quantity: 3 }, withKey(key));
    expect(first.status).toBe(201);
    const again = await as(assembler).post('/api/batches', { modelId, quantity: 3 }, withKey(key));
    expect(again.status).toBe(201);
    expect(again.body).toEqual(first.body);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(await batchCount()).toBe(before + 1);
    // Without a key every request runs.
    await as(assembler).post('/api/batches', { modelId, quantity: 1 });
    expect(await batchCount()).toBe(before + 2);
  });

  it('concurrent repeats run the handler once (the others replay or get 409 IDEMPOTENCY_IN_PROGRESS)', async () => {
    const key = `k-${sfx()}`;
    const before = await batchCount();
    const results = await Promise.all(
      Array.from({ length: 8 }, () => as(assembler).post('/api/batches', { modelId, quantity: 2 }, withKey(key))),
    );
    expect(await batchCount()).toBe(before + 1);
    const created = results.filter((r) => r.status === 201);
    expect(new Set(created.map((r) => r.body.batch.id)).size).toBe(1);
    for (const r of results.filter((x) => x.status !== 201)) {
      expect(r.status).toBe(409);
      expect(r.body.error.code).toBe('IDEMPOTENCY_IN_PROGRESS');
    }
  });

  it('keys are per person; the same key on another path is 422 IDEMPOTENCY_KEY_REUSED; a key over 200 characters is 400', async () => {
    const key = `k-${sfx()}`;
    const before = await batchCount();
    expect((await as(assembler).post('/api/batches', { modelId, quantity: 1 }, withKey(key))).status).toBe(201);
    expect((await as(quality).post('/api/batches', { modelId, quantity: 1 }, withKey(key))).status).toBe(201);
    expect(await batchCount()).toBe(before + 2);
    const reused = await as(assembler).post('/api/readings', { area: 'x', at: new Date().toISOString(), tempC: 20 }, withKey(key));
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('IDEMPOTENCY_KEY_REUSED');
    const long = await as(assembler).post('/api/batches', { modelId, quantity: 1 }, withKey('x'.repeat(201)));
    expect(long.status).toBe(400);
    expect(long.body.error.details[0].field).toBe('Idempotency-Key');
    expect(await batchCount()).toBe(before + 2);
  });

  it('a refusal is replayed too (the first answer stands)', async () => {
    const key = `k-${sfx()}`;
    const first = await as(assembler).post('/api/batches', { modelId, quantity: 0 }, withKey(key));
    expect(first.status).toBe(400);
    const again = await as(assembler).post('/api/batches', { modelId, quantity: 0 }, withKey(key));
    expect(again.status).toBe(400);
    expect(again.body).toEqual(first.body);
  });

  it('a 5xx answer is not kept: the retry runs the handler again', async () => {
    let calls = 0;
    const probe = express();
    probe.use(
      express.json(),
      (req, _res, next) => {
        req.actor = { id: assembler.id, email: assembler.email, name: assembler.name, roles: assembler.roles };
        next();
      },
      idempotency,
    );
    probe.post('/api/probe', (_req, res) => {
      calls += 1;
      if (calls === 1) res.status(503).json({ error: { code: 'DOWN', message: 'try again' } });
      else res.status(201).json({ ok: calls });
    });
    probe.use(errorHandler);
    const server = await listen(probe as unknown as Parameters<typeof listen>[0]);
    try {
      const key = `k-${sfx()}`;
      const client = api(server.baseUrl);
      expect((await client.post('/api/probe', {}, withKey(key))).status).toBe(503);
      expect(await db.select().from(idempotencyKeys).where(eq(idempotencyKeys.key, key))).toHaveLength(0);
      const retry = await client.post('/api/probe', {}, withKey(key));
      expect(retry.status).toBe(201);
      expect(retry.body).toEqual({ ok: 2 });
      expect((await client.post('/api/probe', {}, withKey(key))).body).toEqual({ ok: 2 });
      expect(calls).toBe(2);
    } finally {
      await server.close();
    }
  });
});

// The station load claims its key in its own first statement and stores a new load's answer with
// its writes (server/middleware/idempotency.ts, CLAIMED_BY_HANDLER): the same promises must hold.
describe('Idempotency-Key on a station load (claimed by the load itself)', () => {
  async function loadSetup() {
    const glue = await createMaterial({ name: 'Dust cap glue', openLifeHours: 8 });
    const other = await createMaterial({ name: 'Lead wire', kind: 'wire', unit: 'm' });
    const station = await createStation({ kind: `cap ${sfx()}` });
    const model = await createModel({
      steps: [{ name: 'Glue dust cap', stationKind: station.kind, materials: [{ materialId: glue.id, amountPerUnit: 1 }] }],
    });
    const batch = await createBatch({ modelId: model.id, quantity: 4 });
    const lot = await createLot({ materialId: glue.id, containers: 2 });
    const wrong = await createLot({ materialId: other.id });
    return { station, batch, containers: lot.containers, wrong: wrong.containers[0] };
  }
  const loadsOf = async (containerId: string) => db.select().from(stationLoads).where(eq(stationLoads.containerId, containerId));
  const keyRow = async (key: string) => (await db.select().from(idempotencyKeys).where(eq(idempotencyKeys.key, key)))[0];

  it('a new load is stored with its writes; the repeat replays it exactly and loads nothing more', async () => {
    const { station, batch, containers } = await loadSetup();
    const key = `load-${sfx()}`;
    const body = { batchId: batch.id, containerCode: containers[0].code };
    const first = await as(assembler).post(`/api/stations/${station.id}/load`, body, withKey(key));
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    expect(first.body).toMatchObject({ opened: true, alreadyLoaded: false });
    const row = await keyRow(key);
    expect(row.statusCode).toBe(200);
    expect(row.responseBody).toEqual(first.body);
    const again = await as(assembler).post(`/api/stations/${station.id}/load`, body, withKey(key));
    expect(again.status).toBe(200);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(await loadsOf(containers[0].id)).toHaveLength(1);
    // The same load under a new key runs: already loaded, not opened again.
    const fresh = await as(assembler).post(`/api/stations/${station.id}/load`, body, withKey(`load-${sfx()}`));
    expect(fresh.body).toMatchObject({ id: first.body.id, opened: false, alreadyLoaded: true });
  });

  it('a refusal is kept and replayed; the key with another body is 422; a refusal before the claim is not kept', async () => {
    const { station, batch, containers, wrong } = await loadSetup();
    const key = `load-${sfx()}`;
    const refused = await as(assembler).post(
      `/api/stations/${station.id}/load`,
      { batchId: batch.id, containerCode: wrong.code },
      withKey(key),
    );
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('WRONG_MATERIAL');
    const again = await as(assembler).post(
      `/api/stations/${station.id}/load`,
      { batchId: batch.id, containerCode: wrong.code },
      withKey(key),
    );
    expect(again.status).toBe(409);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(again.body).toEqual(refused.body);
    const reused = await as(assembler).post(
      `/api/stations/${station.id}/load`,
      { batchId: batch.id, containerCode: containers[1].code },
      withKey(key),
    );
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('IDEMPOTENCY_KEY_REUSED');
    expect(await loadsOf(containers[1].id)).toHaveLength(0);
    // Refused by input validation, before the load claims anything: nothing kept under the key.
    const badKey = `load-${sfx()}`;
    const bad = await as(assembler).post(
      `/api/stations/${station.id}/load`,
      { batchId: 'not-an-id', containerCode: containers[1].code },
      withKey(badKey),
    );
    expect(bad.status).toBe(400);
    expect(await keyRow(badKey)).toBeUndefined();
  });

  it('a key whose first request died unanswered is taken over, and the load runs', async () => {
    const { station, batch, containers } = await loadSetup();
    const key = `load-${sfx()}`;
    const path = `/api/stations/${station.id}/load`;
    await db
      .insert(idempotencyKeys)
      .values({ key, actorId: assembler.id, method: 'POST', path, requestHash: null, createdAt: new Date(Date.now() - 10 * 60_000) });
    const res = await as(assembler).post(path, { batchId: batch.id, containerCode: containers[0].code }, withKey(key));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.alreadyLoaded).toBe(false);
    expect((await keyRow(key)).statusCode).toBe(200);
    // One still running (recent, unanswered) is not: 409 in progress, nothing loaded.
    const busy = `load-${sfx()}`;
    await db.insert(idempotencyKeys).values({ key: busy, actorId: assembler.id, method: 'POST', path, requestHash: null });
    const waiting = await as(assembler).post(path, { batchId: batch.id, containerCode: containers[1].code }, withKey(busy));
    expect(waiting.status).toBe(409);
    expect(waiting.body.error.code).toBe('IDEMPOTENCY_IN_PROGRESS');
    expect(await loadsOf(containers[1].id)).toHaveLength(0);
  });
});
