import { and, eq, inArray } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, containers, lots } from '../../server/db/schema';
import { sqlLotExpiries } from '../../server/services/lots';
import { lotExpiry } from '../../shared/expiry';
import { fefoResultSchema } from '../../shared/schemas/containers';
import { lotDetailSchema, lotHistorySchema, lotPageSchema, lotStatusChangesSchema } from '../../shared/schemas/lots';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, newSupplier, receive, uniq } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let quality: TestUser;
let assembler: TestUser;
let purchasing: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, quality, assembler, purchasing] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['quality']),
    ensureUser(['assembler']),
    ensureUser(['purchasing']),
  ]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const ymdOffset = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

async function heldLot() {
  const supplier = await newSupplier(as(admin));
  const material = await newMaterial(as(admin), { requiresInspection: true, shelfLifeDays: 365 });
  return receive(as(clerk), { materialId: material.id, supplierId: supplier.id, containers: 2 });
}

describe('lot status', () => {
  it('401, 403 for roles other than quality, 400 for a bad status or id, 404 for an unknown lot', async () => {
    const { lot } = await heldLot();
    expect((await as().post(`/api/lots/${lot.id}/status`, { status: 'released' })).status).toBe(401);
    expect((await as(clerk).post(`/api/lots/${lot.id}/status`, { status: 'released' })).status).toBe(403);
    expect((await as(admin).post(`/api/lots/${lot.id}/status`, { status: 'released' })).status).toBe(403);
    expect(fields((await as(quality).post(`/api/lots/${lot.id}/status`, { status: 'used_up' })).body)).toEqual(['status']);
    expect(fields((await as(quality).post(`/api/lots/${lot.id}/status`, {})).body)).toEqual(['status']);
    expect(fields((await as(quality).post('/api/lots/lot-1/status', { status: 'released' })).body)).toEqual(['params.id']);
    expect((await as(quality).post(`/api/lots/${crypto.randomUUID()}/status`, { status: 'released' })).status).toBe(404);
    const [row] = await db.select().from(lots).where(eq(lots.id, lot.id));
    expect(row.status).toBe('on_hold');
  });

  it('follows the allowed transitions, requires reasons, and audits each change with who, old, new and why', async () => {
    const { lot } = await heldLot();
    const q = as(quality);
    const path = `/api/lots/${lot.id}/status`;
    expect((await q.post(path, { status: 'released' })).body.lot.status).toBe('released');
    const noReason = await q.post(path, { status: 'quarantined', reason: '  ' });
    expect(noReason.status).toBe(400);
    expect(fields(noReason.body)).toEqual(['reason']);
    expect((await q.post(path, { status: 'rejected', reason: 'Cure test failed' })).status).toBe(409);
    const quarantined = await q.post(path, { status: 'quarantined', reason: 'Supplier notice: viscosity drift' });
    expect(quarantined.body.lot).toMatchObject({ status: 'quarantined', statusReason: 'Supplier notice: viscosity drift' });
    const lift = await q.post(path, { status: 'released' });
    expect(lift.status).toBe(400);
    expect(fields(lift.body)).toEqual(['reason']);
    expect((await q.post(path, { status: 'released', reason: 'Retest passed' })).body.lot.status).toBe('released');
    await q.post(path, { status: 'quarantined', reason: 'Second notice' });
    expect((await q.post(path, { status: 'rejected', reason: 'Confirmed out of spec' })).body.lot.status).toBe('rejected');
    for (const status of ['released', 'quarantined', 'rejected']) {
      const final = await q.post(path, { status, reason: 'try again' });
      expect(final.status).toBe(409);
      expect(final.body.error.code).toBe('INVALID_TRANSITION');
    }

    const entries = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, lot.id), eq(auditLog.action, 'lot.status')))
      .orderBy(auditLog.id);
    expect(entries.map((e) => [(e.before as { status: string }).status, (e.after as { status: string }).status, e.reason])).toEqual([
      ['on_hold', 'released', null],
      ['released', 'quarantined', 'Supplier notice: viscosity drift'],
      ['quarantined', 'released', 'Retest passed'],
      ['released', 'quarantined', 'Second notice'],
      ['quarantined', 'rejected', 'Confirmed out of spec'],
    ]);
    expect(entries.every((e) => e.actorId === quality.id)).toBe(true);
  });

  it('history lists the lot and container entries with names, oldest first, for quality and admin only', async () => {
    const { lot, containers: cs } = await heldLot();
    await as(quality).post(`/api/lots/${lot.id}/status`, { status: 'released' });
    await as(assembler).post(`/api/containers/${cs[0].id}/open`);
    await as(clerk).post(`/api/containers/${cs[1].id}/location`, { location: 'Fridge 2' });
    expect((await as().get(`/api/lots/${lot.id}/history`)).status).toBe(401);
    // Names and before/after values are for quality and administrators (lots.readHistory).
    for (const other of [assembler, clerk, purchasing]) expect((await as(other).get(`/api/lots/${lot.id}/history`)).status).toBe(403);
    for (const reader of [quality, admin]) {
      const res = await as(reader).get(`/api/lots/${lot.id}/history`);
      expect(res.status).toBe(200);
      const { items } = lotHistorySchema.parse(res.body);
      expect(items.map((i) => i.action)).toEqual(['lot.receive', 'lot.status', 'container.open', 'container.move']);
      expect(items.map((i) => i.actorName)).toEqual([clerk.name, quality.name, assembler.name, clerk.name]);
      expect(items[2]).toMatchObject({ entityType: 'container', containerCode: cs[0].code, before: { status: 'sealed', openedAt: null } });
      expect(items[3].after).toEqual({ location: 'Fridge 2' });
    }
    expect((await as(quality).get('/api/lots/00000000-0000-4000-8000-000000000000/history')).status).toBe(404);
  });

  it('status changes: every signed-in role sees status, time and reason, no names or records', async () => {
    const { lot } = await heldLot();
    await as(quality).post(`/api/lots/${lot.id}/status`, { status: 'released' });
    await as(quality).post(`/api/lots/${lot.id}/status`, { status: 'quarantined', reason: 'Supplier notice: viscosity drift' });
    expect((await as().get(`/api/lots/${lot.id}/status-changes`)).status).toBe(401);
    for (const reader of [assembler, clerk, purchasing, quality, admin]) {
      const res = await as(reader).get(`/api/lots/${lot.id}/status-changes`);
      expect(res.status).toBe(200);
      const { items } = lotStatusChangesSchema.parse(res.body);
      expect(items.map((i) => [i.from, i.to, i.reason])).toEqual([
        [null, 'on_hold', null],
        ['on_hold', 'released', null],
        ['released', 'quarantined', 'Supplier notice: viscosity drift'],
      ]);
      for (const item of res.body.items) expect(Object.keys(item).sort()).toEqual(['at', 'from', 'reason', 'to']);
      expect(JSON.stringify(res.body)).not.toContain(quality.name);
    }
    expect((await as(assembler).get('/api/lots/00000000-0000-4000-8000-000000000000/status-changes')).status).toBe(404);
  });
});

describe('lot list', () => {
  it('pages, filters, searches and sorts on the server', async () => {
    const supplier = await newSupplier(as(admin));
    const material = await newMaterial(as(admin), { shelfLifeDays: 200, requiresInspection: true });
    const tag = uniq();
    const received = [];
    for (const [i, expiresOn] of [ymdOffset(40), ymdOffset(5), null, ymdOffset(400)].entries()) {
      received.push(
        await receive(as(clerk), {
          materialId: material.id,
          supplierId: supplier.id,
          supplierLot: `LS-${tag}-${i}`,
          expiresOn,
          containers: i + 1,
        }),
      );
    }
    await as(quality).post(`/api/lots/${received[1].lot.id}/status`, { status: 'released' });

    expect((await as().get('/api/lots')).status).toBe(401);
    const all = lotPageSchema.parse((await as(assembler).get(`/api/lots?materialId=${material.id}&sort=effectiveExpiry&dir=asc`)).body);
    expect(all.total).toBe(4);
    // Expiries: +5 d, +40 d, none → shelf life 200 d from receipt, +400 d → shelf life wins (200 d).
    expect(all.items.map((i) => i.supplierLot)).toEqual([1, 0, 2, 3].map((i) => `LS-${tag}-${i}`));
    const times = all.items.map((i) => Date.parse(i.effectiveExpiry ?? ''));
    expect([...times].sort((a, b) => a - b)).toEqual(times);
    expect(all.items[0]).toMatchObject({
      materialCode: material.code,
      materialName: material.name,
      supplierName: supplier.name,
      containerCount: 2,
      activeContainerCount: 2,
      remaining: 500,
      materialUnit: 'g',
    });

    const page = lotPageSchema.parse(
      (await as(assembler).get(`/api/lots?materialId=${material.id}&sort=supplierLot&dir=desc&limit=2&offset=1`)).body,
    );
    expect(page.total).toBe(4);
    expect(page.items.map((i) => i.supplierLot)).toEqual([`LS-${tag}-2`, `LS-${tag}-1`]);
    const held = (await as(assembler).get(`/api/lots?materialId=${material.id}&status=on_hold`)).body;
    expect(held.total).toBe(3);
    const both = (await as(assembler).get(`/api/lots?materialId=${material.id}&status=on_hold,released`)).body;
    expect(both.total).toBe(4);
    const soon = (await as(assembler).get(`/api/lots?materialId=${material.id}&expiringWithinDays=30`)).body;
    expect(soon.items.map((i: { supplierLot: string }) => i.supplierLot)).toEqual([`LS-${tag}-1`]);
    const bySupplier = (await as(assembler).get(`/api/lots?supplierId=${supplier.id}`)).body;
    expect(bySupplier.total).toBe(4);
    const text = (await as(assembler).get(`/api/lots?q=${encodeURIComponent(`ls-${tag}-3`)}`)).body;
    expect(text.items.map((i: { id: string }) => i.id)).toEqual([received[3].lot.id]);
    const byCode = (await as(assembler).get(`/api/lots?q=${received[2].containers[1].code.toLowerCase()}`)).body;
    expect(byCode.items.map((i: { id: string }) => i.id)).toEqual([received[2].lot.id]);
    const wildcard = (await as(assembler).get(`/api/lots?materialId=${material.id}&q=%25`)).body;
    expect(wildcard.total).toBe(0);
    const byMaterial = (await as(assembler).get(`/api/lots?supplierId=${supplier.id}&sort=material&dir=asc`)).body;
    expect(byMaterial.total).toBe(4);

    for (const [query, field] of [
      ['sort=colour', 'query.sort'],
      ['limit=0', 'query.limit'],
      ['status=lost', 'query.status.0'],
      ['materialId=7', 'query.materialId'],
      ['expiringWithinDays=-1', 'query.expiringWithinDays'],
    ]) {
      const bad = await as(assembler).get(`/api/lots?${query}`);
      expect(bad.status, query).toBe(400);
      expect(fields(bad.body), query).toEqual([field]);
    }
  });

  it('sorts and filters by an SQL expiry that agrees with shared/expiry.ts lotExpiry in several zones', async () => {
    const supplier = await newSupplier(as(admin));
    const cases = [
      { shelf: 30, mfg: '2026-01-10', exp: null, at: '2026-01-20T09:30:00.000Z' },
      { shelf: 30, mfg: null, exp: null, at: '2026-03-20T23:30:00.000Z' }, // crosses the EU DST change (2026-03-29)
      { shelf: 180, mfg: '2025-10-01', exp: '2026-03-28', at: '2026-01-05T12:00:00.000Z' },
      { shelf: null, mfg: null, exp: '2026-10-25', at: '2026-02-01T00:00:00.000Z' },
      { shelf: null, mfg: null, exp: null, at: '2026-02-01T00:00:00.000Z' },
      { shelf: 1, mfg: null, exp: null, at: '2026-11-01T05:30:00.000Z' }, // US DST ends 2026-11-01
    ];
    const made: {
      id: string;
      material: { shelfLifeDays: number | null };
      lot: { receivedAt: string; manufacturedOn: string | null; expiresOn: string | null };
    }[] = [];
    for (const c of cases) {
      const material = await newMaterial(as(admin), { shelfLifeDays: c.shelf });
      const { lot } = await receive(as(clerk), {
        materialId: material.id,
        supplierId: supplier.id,
        manufacturedOn: c.mfg,
        expiresOn: c.exp,
        receivedAt: c.at,
        containers: 1,
      });
      made.push({ id: lot.id, material, lot });
    }
    for (const zone of ['UTC', 'Europe/Berlin', 'America/New_York', 'Pacific/Auckland', 'Asia/Kolkata']) {
      const fromSql = await sqlLotExpiries(
        made.map((m) => m.id),
        zone,
      );
      for (const m of made) {
        const expected = lotExpiry(
          {
            shelfLifeDays: m.material.shelfLifeDays,
            openLifeHours: null,
            thawedLifeHours: null,
            outOfStorageAllowanceHours: null,
            potLifeMinutes: null,
            storageClass: 'ambient',
          },
          m.lot,
          zone,
        );
        expect(fromSql.get(m.id), `${zone} ${JSON.stringify(m.lot)}`).toBe(expected.at);
      }
    }
  });
});

describe('lot detail and FEFO', () => {
  it('GET /api/lots/:id gives containers with expiry, certificate and the FEFO hint; 404/400/401', async () => {
    const { lot, containers: cs } = await heldLot();
    expect((await as().get(`/api/lots/${lot.id}`)).status).toBe(401);
    expect(fields((await as(assembler).get('/api/lots/abc')).body)).toEqual(['params.id']);
    expect((await as(assembler).get(`/api/lots/${crypto.randomUUID()}`)).status).toBe(404);
    const res = await as(assembler).get(`/api/lots/${lot.id}`);
    expect(res.status).toBe(200);
    const detail = lotDetailSchema.parse(res.body);
    expect(detail.containers.map((c) => c.id)).toEqual(cs.map((c) => c.id));
    expect(detail.effectiveExpiry).toBe(lot.effectiveExpiry);
    expect(detail.containers[0].effectiveExpiry).toBe(lot.effectiveExpiry);
    expect(detail).toMatchObject({ certificate: null, fefoNext: null, expiryCause: 'shelf_life' });
  });

  it('orders usable containers first-expiry-first-out and points at an open one first', async () => {
    const supplier = await newSupplier(as(admin));
    const material = await newMaterial(as(admin), { shelfLifeDays: 365, openLifeHours: 720 });
    const late = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, expiresOn: ymdOffset(90), containers: 1 });
    const early = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, expiresOn: ymdOffset(10), containers: 2 });
    const expired = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, expiresOn: ymdOffset(-1), containers: 1 });
    const quarantined = await receive(as(clerk), {
      materialId: material.id,
      supplierId: supplier.id,
      expiresOn: ymdOffset(3),
      containers: 1,
    });
    await as(quality).post(`/api/lots/${quarantined.lot.id}/status`, { status: 'quarantined', reason: 'Suspect' });
    await db.update(containers).set({ status: 'empty', remaining: '0' }).where(eq(containers.id, early.containers[1].id));

    expect((await as().get(`/api/materials/${material.id}/fefo`)).status).toBe(401);
    const first = fefoResultSchema.parse((await as(assembler).get(`/api/materials/${material.id}/fefo`)).body);
    expect(first.items.map((c) => c.id)).toEqual([early.containers[0].id, late.containers[0].id]);
    expect(first.items.map((c) => c.id)).not.toContain(expired.containers[0].id);
    expect(first).toMatchObject({
      nextReason: 'earliest_expiry',
      next: { id: early.containers[0].id, supplierLot: early.lot.supplierLot },
    });

    await as(assembler).post(`/api/containers/${late.containers[0].id}/open`);
    const second = fefoResultSchema.parse((await as(assembler).get(`/api/materials/${material.id}/fefo`)).body);
    expect(second).toMatchObject({ nextReason: 'open_first', next: { id: late.containers[0].id, status: 'open' } });
    const detail = lotDetailSchema.parse((await as(assembler).get(`/api/lots/${early.lot.id}`)).body);
    expect(detail.fefoNext?.id).toBe(late.containers[0].id);
    expect((await as(assembler).get(`/api/materials/${crypto.randomUUID()}/fefo`)).status).toBe(404);
    const ids = [late, early, expired, quarantined].map((r) => r.lot.id);
    expect(await db.select({ id: lots.id }).from(lots).where(inArray(lots.id, ids))).toHaveLength(4);
  });
});
