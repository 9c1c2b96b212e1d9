import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, containers, lots } from '../../server/db/schema';
import { containerResultSchema } from '../../shared/schemas/containers';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, newSupplier, receive } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let quality: TestUser;
let assembler: TestUser;
let purchasing: TestUser;
let supplierId: string;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, quality, assembler, purchasing] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['quality']),
    ensureUser(['assembler']),
    ensureUser(['purchasing']),
  ]);
  supplierId = (await newSupplier(as(admin))).id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const HOUR = 3_600_000;

async function lotOf(material: Record<string, unknown>, receipt: Record<string, unknown> = {}) {
  const m = await newMaterial(as(admin), material);
  return receive(as(clerk), { materialId: m.id, supplierId, containers: 2, ...receipt });
}

describe('container actions: access and input', () => {
  it('401 without a session, 403 for roles that do not handle containers, 400/404 for ids', async () => {
    const {
      containers: [c],
    } = await lotOf({});
    expect((await as().post(`/api/containers/${c.id}/open`)).status).toBe(401);
    expect((await as(purchasing).post(`/api/containers/${c.id}/open`)).status).toBe(403);
    expect((await as(admin).post(`/api/containers/${c.id}/open`)).status).toBe(403);
    expect((await as(assembler).post(`/api/containers/${c.id}/scrap`, { reason: 'Dropped' })).status).toBe(403);
    expect(fields((await as(assembler).post('/api/containers/c-1/open')).body)).toEqual(['params.id']);
    expect((await as(assembler).post(`/api/containers/${crypto.randomUUID()}/open`)).status).toBe(404);
    expect(fields((await as(clerk).post(`/api/containers/${c.id}/location`, { location: ' ' })).body)).toEqual(['location']);
    expect(fields((await as(quality).post(`/api/containers/${c.id}/scrap`, {})).body)).toEqual(['reason']);
    expect((await as(assembler).get(`/api/containers/${c.id}`)).body.container.status).toBe('sealed');
    const [row] = await db.select().from(containers).where(eq(containers.id, c.id));
    expect(row).toMatchObject({ status: 'sealed', location: null });
  });
});

describe('opening', () => {
  it('refuses a lot on hold and an expired lot (409), opens a released one and starts its after-opening life', async () => {
    const held = await lotOf({ requiresInspection: true, shelfLifeDays: 365, openLifeHours: 48 });
    const refused = await as(assembler).post(`/api/containers/${held.containers[0].id}/open`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('LOT_ON_HOLD');

    const expired = await lotOf({}, { expiresOn: new Date(Date.now() - 2 * 86_400_000).toISOString().slice(0, 10) });
    const late = await as(assembler).post(`/api/containers/${expired.containers[0].id}/open`);
    expect(late.status).toBe(409);
    expect(late.body.error).toMatchObject({ code: 'EXPIRED', details: { cause: 'supplier_expiry' } });

    await as(quality).post(`/api/lots/${held.lot.id}/status`, { status: 'released' });
    const res = await as(assembler).post(`/api/containers/${held.containers[0].id}/open`);
    expect(res.status).toBe(200);
    const { container } = containerResultSchema.parse(res.body);
    expect(container.status).toBe('open');
    // After-opening life 48 h is earlier than a 365-day shelf life.
    expect(container.expiryCause).toBe('open_life');
    expect(Date.parse(container.effectiveExpiry ?? '') - Date.parse(container.openedAt ?? '')).toBe(48 * HOUR);
    const again = await as(assembler).post(`/api/containers/${held.containers[0].id}/open`);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('INVALID_TRANSITION');
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, container.id), eq(auditLog.action, 'container.open')));
    expect(audit).toMatchObject({
      actorId: assembler.id,
      before: { status: 'sealed', openedAt: null },
      after: { status: 'open', openedAt: container.openedAt },
    });

    await as(quality).post(`/api/lots/${held.lot.id}/status`, { status: 'quarantined', reason: 'Suspect batch' });
    const q = await as(assembler).post(`/api/containers/${held.containers[1].id}/open`);
    expect(q.body.error.code).toBe('LOT_QUARANTINED');
  });
});

describe('frozen and refrigerated material', () => {
  it('frozen: must be thawed before opening; thawed life then limits it; thaw once only', async () => {
    const {
      containers: [c],
    } = await lotOf({ storageClass: 'frozen', thawedLifeHours: 4, shelfLifeDays: 180 });
    const notThawed = await as(assembler).post(`/api/containers/${c.id}/open`);
    expect(notThawed.body.error.code).toBe('NOT_THAWED');
    const thawed = containerResultSchema.parse((await as(assembler).post(`/api/containers/${c.id}/thaw`)).body).container;
    expect(thawed.expiryCause).toBe('thawed_life');
    expect(Date.parse(thawed.effectiveExpiry ?? '') - Date.parse(thawed.thawedAt ?? '')).toBe(4 * HOUR);
    expect((await as(assembler).post(`/api/containers/${c.id}/thaw`)).body.error.code).toBe('ALREADY_THAWED');
    expect((await as(assembler).post(`/api/containers/${c.id}/open`)).status).toBe(200);

    const ambient = await lotOf({});
    expect((await as(assembler).post(`/api/containers/${ambient.containers[0].id}/thaw`)).body.error.code).toBe('NOT_FROZEN');
  });

  it('refrigerated: counts minutes out of cold storage, rounded up', async () => {
    const {
      containers: [c],
    } = await lotOf({ storageClass: 'refrigerated', outOfStorageAllowanceHours: 2, shelfLifeDays: 300 });
    const path = (a: string) => `/api/containers/${c.id}/${a}`;
    expect((await as(clerk).post(path('return-to-storage'))).body.error.code).toBe('NOT_OUT_OF_STORAGE');
    const out = containerResultSchema.parse((await as(clerk).post(path('out-of-storage'))).body).container;
    expect(out.outOfStorageSince).not.toBeNull();
    // Out now with 120 minutes allowed: expires 2 h after leaving storage (shared/expiry.ts rule).
    expect(out).toMatchObject({ expiryCause: 'out_of_storage' });
    expect(Date.parse(out.effectiveExpiry ?? '') - Date.parse(out.outOfStorageSince ?? '')).toBe(2 * HOUR);
    expect((await as(clerk).post(path('out-of-storage'))).body.error.code).toBe('ALREADY_OUT_OF_STORAGE');
    // Pretend it left the fridge 90 minutes ago.
    await db
      .update(containers)
      .set({ outOfStorageSince: new Date(Date.now() - 90 * 60_000) })
      .where(eq(containers.id, c.id));
    const back = containerResultSchema.parse((await as(assembler).post(path('return-to-storage'))).body).container;
    expect(back.outOfStorageSince).toBeNull();
    expect(back.outOfStorageMinutes).toBeGreaterThanOrEqual(90);
    expect(back.outOfStorageMinutes).toBeLessThanOrEqual(91);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, c.id), eq(auditLog.action, 'container.return_to_storage')));
    expect(audit.before).toMatchObject({ outOfStorageMinutes: 0 });
    expect(audit.after).toMatchObject({ outOfStorageMinutes: back.outOfStorageMinutes, outOfStorageSince: null });

    const ambient = await lotOf({});
    expect((await as(clerk).post(`/api/containers/${ambient.containers[0].id}/out-of-storage`)).body.error.code).toBe('NOT_REFRIGERATED');
  });
});

describe('location, empty and scrap', () => {
  it('moves, empties and scraps with audit; the lot is used up when its last container is gone', async () => {
    const {
      lot,
      containers: [a, b],
    } = await lotOf({});
    const moved = await as(clerk).post(`/api/containers/${a.id}/location`, { location: 'Cabinet B4' });
    expect(moved.body.container.location).toBe('Cabinet B4');
    // Emptying is recorded where the container is used (station, quality), not at the dock.
    const byClerk = await as(clerk).post(`/api/containers/${a.id}/empty`);
    expect(byClerk.status).toBe(403);
    expect(byClerk.body.error.code).toBe('FORBIDDEN');
    expect((await db.select().from(containers).where(eq(containers.id, a.id)))[0].status).toBe('sealed');
    const emptied = await as(assembler).post(`/api/containers/${a.id}/empty`);
    expect(emptied.body.container).toMatchObject({ status: 'empty', remaining: 0 });
    expect((await as(assembler).post(`/api/containers/${a.id}/empty`)).body.error.code).toBe('CONTAINER_EMPTY');
    expect((await as(assembler).post(`/api/containers/${a.id}/location`, { location: 'Bin' })).body.error.code).toBe('CONTAINER_EMPTY');
    expect((await db.select().from(lots).where(eq(lots.id, lot.id)))[0].status).toBe('released');

    const scrapped = await as(quality).post(`/api/containers/${b.id}/scrap`, { reason: 'Cartridge cracked in transit' });
    expect(scrapped.body.container).toMatchObject({ status: 'scrapped', remaining: 250 });
    expect((await as(clerk).post(`/api/containers/${b.id}/scrap`, { reason: 'again' })).body.error.code).toBe('CONTAINER_SCRAPPED');
    const [row] = await db.select().from(lots).where(eq(lots.id, lot.id));
    expect(row.status).toBe('used_up');

    const [scrapAudit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, b.id), eq(auditLog.action, 'container.scrap')));
    expect(scrapAudit).toMatchObject({
      actorId: quality.id,
      reason: 'Cartridge cracked in transit',
      before: { status: 'sealed' },
      after: { status: 'scrapped' },
    });
    const [usedUp] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, lot.id), eq(auditLog.action, 'lot.status')));
    expect(usedUp).toMatchObject({ before: { status: 'released' }, after: { status: 'used_up' } });
    const final = await as(quality).post(`/api/lots/${lot.id}/status`, { status: 'quarantined', reason: 'late notice' });
    expect(final.body.error.code).toBe('INVALID_TRANSITION');
  });
});
