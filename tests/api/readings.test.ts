import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, readings } from '../../server/db/schema';
import { readingListSchema, readingPageSchema, readingSchema } from '../../shared/schemas/readings';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { sfx } from '../helpers/fixtures';

let app: TestApp;
let assembler: TestUser;
let admin: TestUser;
let quality: TestUser;
let receiving: TestUser;
let purchasing: TestUser;
beforeAll(async () => {
  app = await startApp();
  [assembler, admin, quality, receiving, purchasing] = await Promise.all([
    ensureUser(['assembler']),
    ensureUser(['admin']),
    ensureUser(['quality']),
    ensureUser(['receiving']),
    ensureUser(['purchasing']),
  ]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const iso = (msFromNow: number) => new Date(Date.now() + msFromNow).toISOString();
const fields = (res: { body: { error: { details: { field: string }[] } } }) => res.body.error.details.map((d) => d.field);

describe('shop-condition readings', () => {
  it('401, 403 for receiving and purchasing', async () => {
    const body = { area: 'Line A', at: iso(0), tempC: 22 };
    expect((await as().post('/api/readings', body)).status).toBe(401);
    expect((await as(receiving).post('/api/readings', body)).status).toBe(403);
    expect((await as(purchasing).post('/api/readings', body)).status).toBe(403);
    expect((await as().get('/api/readings')).status).toBe(401);
  });

  it('400 naming the field: tempC -60..150, rhPct 0..100, at not more than 5 min ahead, area required', async () => {
    const ok = { area: `A-${sfx()}`, at: iso(-60_000), tempC: 22 };
    expect(fields(await as(assembler).post('/api/readings', { ...ok, tempC: 150.5 }))).toEqual(['tempC']);
    expect(fields(await as(assembler).post('/api/readings', { ...ok, tempC: -61 }))).toEqual(['tempC']);
    expect(fields(await as(assembler).post('/api/readings', { ...ok, rhPct: 101 }))).toEqual(['rhPct']);
    expect(fields(await as(assembler).post('/api/readings', { ...ok, rhPct: -1 }))).toEqual(['rhPct']);
    expect(fields(await as(assembler).post('/api/readings', { ...ok, at: iso(10 * 60_000) }))).toEqual(['at']);
    expect(fields(await as(assembler).post('/api/readings', { ...ok, at: 'yesterday' }))).toEqual(['at']);
    expect(fields(await as(assembler).post('/api/readings', { at: ok.at, tempC: 20 }))).toEqual(['area']);
    expect(fields(await as(assembler).post('/api/readings', { readings: [ok, { ...ok, tempC: 'warm' }] }))).toEqual(['readings.1.tempC']);
    expect(fields(await as(assembler).post('/api/readings', { readings: [] }))).toEqual(['readings']);
    expect(await db.select().from(readings).where(eq(readings.area, ok.area))).toHaveLength(0);
  });

  it('records one (201 Reading, audited) — limits inclusive, 2 min ahead allowed — and many in one body', async () => {
    const area = `Line ${sfx()}`;
    const one = await as(assembler).post('/api/readings', { area, at: iso(2 * 60_000), tempC: 150, rhPct: 100 });
    expect(one.status).toBe(201);
    const r = readingSchema.parse(one.body);
    expect(r).toMatchObject({ area, tempC: 150, rhPct: 100, source: 'manual', recordedBy: assembler.id });
    expect(await db.select().from(auditLog).where(eq(auditLog.entityId, r.id))).toHaveLength(1);

    const many = await as(admin).post('/api/readings', {
      readings: [
        { area, at: iso(-3 * 3_600_000), tempC: -60, rhPct: 0, source: 'logger-7' },
        { area, at: iso(-2 * 3_600_000), tempC: 21.5 },
        { area, at: iso(-1 * 3_600_000), tempC: 23.25, rhPct: 45 },
      ],
    });
    expect(many.status).toBe(201);
    expect(readingListSchema.parse(many.body).items.map((x) => x.tempC)).toEqual([-60, 21.5, 23.25]);
    expect((await as(quality).post('/api/readings', { area, at: iso(-4 * 3_600_000), tempC: 19 })).status).toBe(201);

    const all = readingPageSchema.parse((await as(purchasing).get(`/api/readings?area=${encodeURIComponent(area)}`)).body);
    expect(all.items.map((x) => x.tempC)).toEqual([150, 23.25, 21.5, -60, 19]); // newest first
    const window = readingPageSchema.parse(
      (await as(purchasing).get(`/api/readings?area=${encodeURIComponent(area)}&from=${iso(-2.5 * 3_600_000)}&to=${iso(-0.5 * 3_600_000)}`))
        .body,
    );
    expect(window.items.map((x) => x.tempC)).toEqual([23.25, 21.5]);
    expect(fields(await as(purchasing).get(`/api/readings?from=${iso(0)}&to=${iso(-3_600_000)}`))).toEqual(['query.to']);
  });
});
