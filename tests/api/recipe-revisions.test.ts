import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createLot, createMaterial, createStation, createStepRun, sfx } from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
let kind: string;
let stationId: string;
let glueId: string;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
  const station = await createStation({ kind: `dust cap ${sfx()}` });
  kind = station.kind;
  stationId = station.id;
  glueId = (await createMaterial({ name: 'Cap glue' })).id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

async function newModel() {
  const res = await as(admin).post('/api/models', {
    code: `R${sfx()}`,
    name: 'Revision woofer',
    steps: [{ name: 'Dust cap', stationKind: kind, materials: [{ materialId: glueId, amountPerUnit: 0.4 }], waitForCure: true }],
  });
  expect(res.status).toBe(201);
  return res.body;
}

describe('recipe revisions', () => {
  it('copies a frozen recipe as the next revision, editable, made current; old batches keep the old revision', async () => {
    const rev1 = await newModel();
    expect(rev1).toMatchObject({ revision: 1, current: true });
    const batch1 = await as(assembler).post('/api/batches', { modelId: rev1.id, quantity: 2 });
    expect(batch1.status).toBe(201);
    expect(batch1.body.batch.modelRevision).toBe(1);

    // Frozen: a batch uses revision 1.
    const frozen = await as(admin).patch(`/api/models/${rev1.id}`, { steps: [{ name: 'x', stationKind: kind }] });
    expect(frozen.status).toBe(409);
    expect(frozen.body.error.code).toBe('MODEL_IN_USE');

    const copy = await as(admin).post(`/api/models/${rev1.id}/revisions`);
    expect(copy.status).toBe(201);
    expect(copy.body).toMatchObject({ code: rev1.code, revision: 2, current: false, inUse: false });
    expect(copy.body.steps.map((s: { name: string }) => s.name)).toEqual(['Dust cap']);
    expect(copy.body.steps[0].id).not.toBe(rev1.steps[0].id);

    // One draft at a time.
    const again = await as(admin).post(`/api/models/${rev1.id}/revisions`);
    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({ code: 'REVISION_DRAFT_EXISTS', details: { revision: 2 } });

    const edited = await as(admin).patch(`/api/models/${copy.body.id}`, {
      steps: [
        { name: 'Dust cap, more glue', stationKind: kind, materials: [{ materialId: glueId, amountPerUnit: 0.5 }], waitForCure: true },
      ],
    });
    expect(edited.status).toBe(200);

    // Not current yet: no batch may be built with the draft.
    const early = await as(assembler).post('/api/batches', { modelId: copy.body.id, quantity: 1 });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('MODEL_NOT_CURRENT');

    const made = await as(admin).post(`/api/models/${copy.body.id}/make-current`);
    expect(made.status).toBe(200);
    expect(made.body).toMatchObject({ revision: 2, current: true });

    // Now revision 1 is refused for new batches, and says which revision to use.
    const old = await as(assembler).post('/api/batches', { modelId: rev1.id, quantity: 1 });
    expect(old.status).toBe(409);
    expect(old.body.error).toMatchObject({ code: 'MODEL_NOT_CURRENT', details: { currentRevision: 2 } });
    expect(old.body.error.message).toContain(`${rev1.code} rev 2`);

    const batch2 = await as(assembler).post('/api/batches', { modelId: copy.body.id, quantity: 1 });
    expect(batch2.status).toBe(201);
    expect(batch2.body.batch.modelRevision).toBe(2);
    expect(batch2.body.batch.code).not.toBe(batch1.body.batch.code);

    // The old batch still carries revision 1 and its steps.
    const detail = await as(assembler).get(`/api/batches/${batch1.body.batch.id}`);
    expect(detail.body.batch.modelRevision).toBe(1);
    expect(detail.body.steps.map((s: { name: string }) => s.name)).toEqual(['Dust cap']);

    // Both traces name the revision each batch was built with: one lot used by both batches.
    const lot = await createLot({ materialId: glueId, quantity: 100 });
    await createStepRun({
      batchId: batch1.body.batch.id,
      stepId: rev1.steps[0].id,
      stationId,
      used: [{ containerId: lot.containers[0].id, quantity: 0.8 }],
    });
    await createStepRun({
      batchId: batch2.body.batch.id,
      stepId: made.body.steps[0].id,
      stationId,
      used: [{ containerId: lot.containers[0].id, quantity: 0.5 }],
    });
    const forward = await as(assembler).get(`/api/lots/${lot.id}/trace`);
    expect(forward.status).toBe(200);
    const byCode = Object.fromEntries(forward.body.batches.map((b: { code: string; modelRevision: number }) => [b.code, b.modelRevision]));
    expect(byCode).toEqual({ [batch1.body.batch.code]: 1, [batch2.body.batch.code]: 2 });
    const back1 = await as(assembler).get(`/api/drivers/${batch1.body.drivers[0].serial}/trace`);
    expect(back1.body.batch.modelRevision).toBe(1);
    const back2 = await as(assembler).get(`/api/drivers/${batch2.body.drivers[0].serial}/trace`);
    expect(back2.body.batch.modelRevision).toBe(2);

    // The list counts the batches of each revision (rev 1 frozen by one, rev 2 by one now).
    const revs = await as(admin).get(`/api/models?includeRevisions=true&code=${rev1.code}`);
    expect(
      revs.body.items.map((m: { revision: number; batchCount: number; current: boolean }) => [m.revision, m.batchCount, m.current]),
    ).toEqual([
      [1, 1, false],
      [2, 1, true],
    ]);

    // Lists show the current revision by default, every revision on request.
    const list = await as(assembler).get('/api/models');
    expect(list.body.items.filter((m: { code: string }) => m.code === rev1.code).map((m: { revision: number }) => m.revision)).toEqual([2]);
    const all = await as(admin).get('/api/models?includeRevisions=true');
    expect(all.body.items.filter((m: { code: string }) => m.code === rev1.code).map((m: { revision: number }) => m.revision)).toEqual([
      1, 2,
    ]);
  });

  it('refuses a second model with a taken code, and revisions to other roles', async () => {
    const m = await newModel();
    const dup = await as(admin).post('/api/models', { code: m.code, name: 'x', steps: [{ name: 'a', stationKind: kind }] });
    expect(dup.status).toBe(409);
    expect((await as(assembler).post(`/api/models/${m.id}/revisions`)).status).toBe(403);
    expect((await as().post(`/api/models/${m.id}/revisions`)).status).toBe(401);
    expect((await as(admin).post('/api/models/not-an-id/revisions')).status).toBe(400);
    expect((await as(admin).post('/api/models/00000000-0000-4000-8000-000000000000/revisions')).status).toBe(404);
  });
});
