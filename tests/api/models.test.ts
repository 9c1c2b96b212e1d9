import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog } from '../../server/db/schema';
import { driverModelSchema } from '../../shared/schemas/models';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createMaterial, createStation, sfx } from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
let kindA: string;
let kindB: string;
let glueId: string;
let capId: string;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
  kindA = (await createStation({ kind: `moving parts ${sfx()}` })).kind;
  kindB = (await createStation({ kind: `dust cap ${sfx()}` })).kind;
  glueId = (await createMaterial({ name: 'Spider glue' })).id;
  capId = (await createMaterial({ name: 'Dust cap', kind: 'dust_cap', unit: 'pcs' })).id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

function body(code = `W${sfx()}`) {
  return {
    code,
    name: 'Test woofer 12 in',
    steps: [
      { name: 'Spider and cone', stationKind: kindA, materials: [{ materialId: glueId, amountPerUnit: 1.5 }], waitForCure: false },
      {
        name: 'Dust cap',
        stationKind: kindB,
        materials: [
          { materialId: glueId, amountPerUnit: 0.4 },
          { materialId: capId, amountPerUnit: 1 },
        ],
        waitForCure: true,
      },
    ],
  };
}
const fields = (res: { body: { error: { details: { field: string }[] } } }) => res.body.error.details.map((d) => d.field);

describe('driver models', () => {
  it('401, 403 for a non-admin, 400 naming the field', async () => {
    expect((await as().get('/api/models')).status).toBe(401);
    expect((await as().post('/api/models', body())).status).toBe(401);
    expect((await as(assembler).post('/api/models', body())).status).toBe(403);
    const noSteps = await as(admin).post('/api/models', { ...body(), steps: [] });
    expect(noSteps.status).toBe(400);
    expect(fields(noSteps)).toContain('steps');
    const badAmount = body();
    badAmount.steps[0].materials[0].amountPerUnit = 0;
    expect(fields(await as(admin).post('/api/models', badAmount))).toContain('steps.0.materials.0.amountPerUnit');
    const twice = body();
    twice.steps[1].materials[1].materialId = glueId;
    expect(fields(await as(admin).post('/api/models', twice))).toContain('steps.1.materials.1.materialId');
  });

  it('refuses a step whose station kind no active station has (400 steps.N.stationKind) and an unknown material', async () => {
    const b = body();
    b.steps[1].stationKind = `no such kind ${sfx()}`;
    const res = await as(admin).post('/api/models', b);
    expect(res.status).toBe(400);
    expect(fields(res)).toEqual(['steps.1.stationKind']);
    const m = body();
    m.steps[0].materials[0].materialId = '00000000-0000-4000-8000-000000000000';
    const res2 = await as(admin).post('/api/models', m);
    expect(res2.status).toBe(400);
    expect(fields(res2)).toEqual(['steps.0.materials.0.materialId']);
  });

  it('creates with steps in seq order (201), lists, refuses a duplicate code', async () => {
    const b = body();
    const res = await as(admin).post('/api/models', b);
    expect(res.status).toBe(201);
    const model = driverModelSchema.parse(res.body);
    expect(model.code).toBe(b.code);
    expect(model.steps.map((s) => [s.seq, s.name, s.waitForCure])).toEqual([
      [1, 'Spider and cone', false],
      [2, 'Dust cap', true],
    ]);
    expect(model.steps[1].materials).toHaveLength(2);
    expect(model.steps[1].materials).toEqual(
      expect.arrayContaining([
        { materialId: glueId, amountPerUnit: 0.4 },
        { materialId: capId, amountPerUnit: 1 },
      ]),
    );
    expect(model.inUse).toBe(false);
    const list = await as(assembler).get('/api/models');
    expect(list.body.items.some((m: { id: string }) => m.id === model.id)).toBe(true);
    const dup = await as(admin).post('/api/models', b);
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('DUPLICATE_CODE');
  });

  it('uses explicit seq values when given and orders by them', async () => {
    const b = body();
    const res = await as(admin).post('/api/models', {
      ...b,
      steps: [
        { ...b.steps[1], seq: 20 },
        { ...b.steps[0], seq: 10 },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body.steps.map((s: { seq: number; name: string }) => `${s.seq}:${s.name}`)).toEqual(['10:Spider and cone', '20:Dust cap']);
    const clash = await as(admin).post('/api/models', {
      ...body(),
      steps: [
        { ...b.steps[0], seq: 1 },
        { ...b.steps[1], seq: 1 },
      ],
    });
    expect(fields(clash)).toContain('steps.1.seq');
  });

  it('PATCH replaces steps while unused (audited with old and new), 409 MODEL_IN_USE once a batch used it', async () => {
    const model = driverModelSchema.parse((await as(admin).post('/api/models', body())).body);
    const one = [{ name: 'Only step', stationKind: kindA, materials: [], waitForCure: false }];
    const res = await as(admin).patch(`/api/models/${model.id}`, { steps: one, name: 'Renamed woofer' });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Renamed woofer');
    expect(res.body.steps.map((s: { name: string }) => s.name)).toEqual(['Only step']);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, model.id), eq(auditLog.action, 'model.update')));
    expect((audit.before as { steps: unknown[] }).steps).toHaveLength(2);
    expect((audit.after as { steps: unknown[] }).steps).toHaveLength(1);

    await createBatch({ modelId: model.id });
    const refused = await as(admin).patch(`/api/models/${model.id}`, { steps: body().steps });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('MODEL_IN_USE');
    const after = driverModelSchema.parse((await as(admin).get(`/api/models/${model.id}`)).body);
    expect(after.steps.map((s) => s.name)).toEqual(['Only step']);
    expect(after.inUse).toBe(true);
    // Other fields may still change.
    expect((await as(admin).patch(`/api/models/${model.id}`, { active: false })).body.active).toBe(false);
    expect((await as(assembler).patch(`/api/models/${model.id}`, { active: true })).status).toBe(403);
  });
});
