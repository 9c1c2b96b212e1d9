import { and, eq, isNull } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, stationLoads } from '../../server/db/schema';
import { stationListSchema, stationScanResultSchema, stationSchema } from '../../shared/schemas/stations';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createLot, createMaterial, createModel, createStation, createStationLoad, sfx } from '../helpers/fixtures';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

describe('stations', () => {
  it('401 not signed in, 403 for a non-admin, 400 naming the field', async () => {
    const body = { code: `S-${sfx()}`, name: 'Dust-cap glue 1', kind: 'dust-cap glue', area: 'Line A' };
    expect((await as().get('/api/stations')).status).toBe(401);
    expect((await as().post('/api/stations', body)).status).toBe(401);
    expect((await as(assembler).post('/api/stations', body)).status).toBe(403);
    const bad = await as(admin).post('/api/stations', { ...body, kind: '   ' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { field: string }) => d.field)).toContain('kind');
    const badCode = await as(admin).post('/api/stations', { ...body, code: 'has space' });
    expect(badCode.status).toBe(400);
    expect(badCode.body.error.details[0].field).toBe('code');
    expect((await as(admin).patch(`/api/stations/not-an-id`, { name: 'x' })).status).toBe(400);
  });

  it('creates (201, audited), lists, refuses a duplicate code (409), patches', async () => {
    const code = `S-${sfx()}`;
    const res = await as(admin).post('/api/stations', { code, name: 'Cone glue 2', kind: 'cone glue', area: 'Line B' });
    expect(res.status).toBe(201);
    const station = stationSchema.parse(res.body);
    expect(station).toMatchObject({ code, name: 'Cone glue 2', kind: 'cone glue', area: 'Line B', active: true });
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, station.id), eq(auditLog.action, 'station.create')));
    expect(audit).toHaveLength(1);

    const dup = await as(admin).post('/api/stations', { code, name: 'Other', kind: 'x', area: 'y' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('DUPLICATE_CODE');

    const list = await as(assembler).get('/api/stations');
    expect(list.status).toBe(200);
    expect(stationListSchema.parse(list.body).items.some((s) => s.id === station.id)).toBe(true);

    const patched = await as(admin).patch(`/api/stations/${station.id}`, { area: 'Line C' });
    expect(patched.status).toBe(200);
    expect(patched.body.area).toBe('Line C');
    const [upd] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, station.id), eq(auditLog.action, 'station.update')));
    expect(upd.before).toMatchObject({ area: 'Line B' });
    expect(upd.after).toMatchObject({ area: 'Line C' });
    expect((await as(admin).patch(`/api/stations/${station.id}`, {})).status).toBe(400);
  });

  it('retire: hidden from the default list, everything loaded there is unloaded, 404 for an unknown id', async () => {
    const st = await createStation();
    const mat = await createMaterial();
    const lot = await createLot({ materialId: mat.id });
    const model = await createModel({ steps: [{ stationKind: st.kind, materials: [{ materialId: mat.id, amountPerUnit: 1 }] }] });
    const batch = await createBatch({ modelId: model.id });
    await createStationLoad({ stationId: st.id, batchId: batch.id, containerId: lot.containers[0].id });

    expect((await as(assembler).post(`/api/stations/${st.id}/retire`)).status).toBe(403);
    const res = await as(admin).post(`/api/stations/${st.id}/retire`);
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);
    const still = await db
      .select()
      .from(stationLoads)
      .where(and(eq(stationLoads.stationId, st.id), isNull(stationLoads.unloadedAt)));
    expect(still).toHaveLength(0);
    const list = stationListSchema.parse((await as(admin).get('/api/stations')).body);
    expect(list.items.some((s) => s.id === st.id)).toBe(false);
    const all = stationListSchema.parse((await as(admin).get('/api/stations?includeRetired=true')).body);
    expect(all.items.some((s) => s.id === st.id)).toBe(true);
    expect((await as(admin).post('/api/stations/00000000-0000-4000-8000-000000000000/retire')).status).toBe(404);
  });

  it('scanning a station label resolves the station', async () => {
    const st = await createStation();
    const res = await as(assembler).post('/api/scans/resolve', { code: st.code });
    expect(res.status).toBe(200);
    expect(stationScanResultSchema.parse(res.body).station).toMatchObject({ id: st.id, kind: st.kind, area: st.area });
  });
});
