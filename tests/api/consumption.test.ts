import { eq, inArray, isNull, and, sum } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { containers, mixes, stationLoads, stepRunMaterials, stepRuns } from '../../server/db/schema';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createLot, createMaterial, createModel, createStation, createTwoPart, daysAgo, sfx, ymd } from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  assembler = await ensureUser(['assembler']);
});
afterAll(() => app.close());
const as = () => api(app.baseUrl, assembler.token);
const container = async (id: string) => (await db.select().from(containers).where(eq(containers.id, id)))[0];

/** N one-unit batches, each with step 1 started at `station` and `code` loaded. */
async function startedBatches(n: number, amountPerUnit: number, materialId: string, codes: string[]) {
  const station = await createStation({ kind: `cone glue ${sfx()}` });
  const model = await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId, amountPerUnit }] }] });
  const batches = [];
  for (let i = 0; i < n; i++) {
    const b = await createBatch({ modelId: model.id, quantity: 1 });
    for (const code of codes) {
      const res = await as().post(`/api/stations/${station.id}/load`, { batchId: b.id, containerCode: code });
      expect(res.status).toBe(200);
    }
    expect((await as().post(`/api/batches/${b.id}/steps/${model.steps[0].id}/start`, { stationId: station.id })).status).toBe(200);
    batches.push(b);
  }
  return { station, model, batches };
}

describe('consumption under concurrent requests', () => {
  it('10 parallel finishes against one container with stock for 3: 3 succeed, 7 are refused, nothing goes negative', async () => {
    const glue = await createMaterial({ name: 'Cone glue' });
    const lot = await createLot({ materialId: glue.id, quantity: 35 });
    const { station, model, batches } = await startedBatches(10, 10, glue.id, [lot.containers[0].code]);

    const results = await Promise.all(
      batches.map((b) => as().post(`/api/batches/${b.id}/steps/${model.steps[0].id}/finish`, { stationId: station.id })),
    );
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 200, 200, 409, 409, 409, 409, 409, 409, 409]);
    for (const r of results.filter((x) => x.status === 409)) expect(r.body.error.code).toBe('INSUFFICIENT_STOCK');

    const c = await container(lot.containers[0].id);
    expect(c.remaining).toBe('5.000');
    const [{ used }] = await db
      .select({ used: sum(stepRunMaterials.quantityUsed) })
      .from(stepRunMaterials)
      .where(eq(stepRunMaterials.containerId, c.id));
    expect(Number(used)).toBe(30);
    const finished = await db
      .select()
      .from(stepRuns)
      .where(
        and(
          inArray(
            stepRuns.batchId,
            batches.map((b) => b.id),
          ),
        ),
      );
    expect(finished.filter((r) => r.finishedAt !== null)).toHaveLength(3);
  });

  it('10 parallel mixes from one resin container with enough for 2', async () => {
    const epoxy = await createTwoPart();
    const resin = await createLot({ materialId: epoxy.resin.id, quantity: 50 });
    const hardener = await createLot({ materialId: epoxy.hardener.id, quantity: 500 });
    const station = await createStation();
    const results = await Promise.all(
      Array.from({ length: 10 }, () =>
        as().post(`/api/stations/${station.id}/mixes`, {
          resinCode: resin.containers[0].code,
          hardenerCode: hardener.containers[0].code,
          resinQuantity: 20,
          hardenerQuantity: 10,
        }),
      ),
    );
    expect(results.filter((r) => r.status === 201)).toHaveLength(2);
    expect(results.filter((r) => r.status === 409).map((r) => r.body.error.code)).toEqual(Array(8).fill('INSUFFICIENT_STOCK'));
    expect(new Set(results.filter((r) => r.status === 201).map((r) => r.body.mix.code)).size).toBe(2);
    expect((await container(resin.containers[0].id)).remaining).toBe('10.000');
    expect((await container(hardener.containers[0].id)).remaining).toBe('480.000');
    expect(await db.select().from(mixes).where(eq(mixes.stationId, station.id))).toHaveLength(2);
  });

  it('10 parallel loads of one sealed container for one batch: one load, opened once', async () => {
    const glue = await createMaterial();
    const lot = await createLot({ materialId: glue.id });
    const station = await createStation();
    const model = await createModel({ steps: [{ stationKind: station.kind, materials: [{ materialId: glue.id, amountPerUnit: 1 }] }] });
    const batch = await createBatch({ modelId: model.id });
    const results = await Promise.all(
      Array.from({ length: 10 }, () =>
        as().post(`/api/stations/${station.id}/load`, { batchId: batch.id, containerCode: lot.containers[0].code }),
      ),
    );
    expect(results.every((r) => r.status === 200)).toBe(true);
    expect(results.filter((r) => r.body.opened)).toHaveLength(1);
    expect(await db.select().from(stationLoads).where(eq(stationLoads.containerId, lot.containers[0].id))).toHaveLength(1);
  });
});

describe('consumption rules', () => {
  it('first-expiry-first-out across two loaded containers; an emptied one is marked empty and unloaded', async () => {
    const glue = await createMaterial({ name: 'Spider glue' });
    const later = await createLot({ materialId: glue.id, quantity: 50, expiresOn: ymd(new Date(Date.now() + 90 * 86_400_000)) });
    const sooner = await createLot({ materialId: glue.id, quantity: 30, expiresOn: ymd(new Date(Date.now() + 10 * 86_400_000)) });
    // Loaded in the "wrong" order: the later-expiring one first.
    const { station, model, batches } = await startedBatches(1, 40, glue.id, [later.containers[0].code, sooner.containers[0].code]);
    const res = await as().post(`/api/batches/${batches[0].id}/steps/${model.steps[0].id}/finish`, { stationId: station.id });
    expect(res.status).toBe(200);
    const byCode = Object.fromEntries(
      res.body.stepRun.materials.map((m: { containerCode: string; quantityUsed: number }) => [m.containerCode, m.quantityUsed]),
    );
    expect(byCode).toEqual({ [sooner.containers[0].code]: 30, [later.containers[0].code]: 10 });
    const s = await container(sooner.containers[0].id);
    expect([s.remaining, s.status]).toEqual(['0.000', 'empty']);
    expect((await container(later.containers[0].id)).remaining).toBe('40.000');
    const stillLoaded = await db
      .select()
      .from(stationLoads)
      .where(and(eq(stationLoads.containerId, s.id), isNull(stationLoads.unloadedAt)));
    expect(stillLoaded).toHaveLength(0);
  });

  it('INSUFFICIENT_STOCK names the material and changes nothing', async () => {
    const glue = await createMaterial({ name: 'Frame glue' });
    const lot = await createLot({ materialId: glue.id, quantity: 5, receivedAt: daysAgo(2) });
    const { station, model, batches } = await startedBatches(1, 6, glue.id, [lot.containers[0].code]);
    const res = await as().post(`/api/batches/${batches[0].id}/steps/${model.steps[0].id}/finish`, { stationId: station.id });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('INSUFFICIENT_STOCK');
    expect(res.body.error.message).toContain(glue.name);
    expect(res.body.error.details).toMatchObject({ materialId: glue.id, needed: 6, available: 5 });
    expect((await container(lot.containers[0].id)).remaining).toBe('5.000');
    const [run] = await db.select().from(stepRuns).where(eq(stepRuns.batchId, batches[0].id));
    expect(run.finishedAt).toBeNull();
    const [m] = await db.select().from(stepRunMaterials).where(eq(stepRunMaterials.stepRunId, run.id));
    expect(m.quantityUsed).toBe('0.000');
  });
});
