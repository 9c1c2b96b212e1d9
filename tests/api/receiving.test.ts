import { and, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, containers, lots } from '../../server/db/schema';
import { isValidContainerCode } from '../../shared/schemas/containers';
import { duplicateLotDetailsSchema, receiveLotResultSchema } from '../../shared/schemas/lots';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, newSupplier, randomGtin, receive, uniq } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let quality: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, quality, assembler] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['quality']),
    ensureUser(['assembler']),
  ]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

async function counts() {
  const [{ l }] = (await db.execute(sql`SELECT count(*)::int AS l FROM lots`)).rows as { l: number }[];
  const [{ c }] = (await db.execute(sql`SELECT count(*)::int AS c FROM containers`)).rows as { c: number }[];
  return { lots: l, containers: c };
}

describe('receiving a lot', () => {
  it('creates the lot and its labelled containers; held for inspection when the material requires it', async () => {
    const supplier = await newSupplier(as(admin));
    const held = await newMaterial(as(admin), { requiresInspection: true, shelfLifeDays: 30 });
    const res = await as(clerk).post('/api/lots', {
      materialId: held.id,
      supplierId: supplier.id,
      supplierLot: '  B-2291  ',
      containers: 3,
      quantityPerContainer: 250.5,
      manufacturedOn: '2026-01-10',
      expiresOn: '2026-02-01',
      receivedAt: '2026-01-20T09:30:00.000Z',
      location: 'Cabinet A2',
      notes: 'Pallet wrap torn',
    });
    expect(res.status).toBe(201);
    const body = receiveLotResultSchema.parse(res.body);
    expect(body.lot).toMatchObject({
      status: 'on_hold',
      supplierLot: 'B-2291',
      manufacturedOn: '2026-01-10',
      expiresOn: '2026-02-01',
      notes: 'Pallet wrap torn',
      receivedBy: clerk.id,
    });
    // Supplier date 2026-02-01 is usable through that day (zone UTC): expires 2026-02-02T00:00Z, before
    // manufacture + 30 days = 2026-02-09 (worked by hand from the rules in shared/expiry.ts).
    expect(body.lot.effectiveExpiry).toBe('2026-02-02T00:00:00.000Z');
    expect(body.lot.expiryCause).toBe('supplier_expiry');
    expect(body.containers.map((c) => c.seq)).toEqual([1, 2, 3]);
    for (const c of body.containers) {
      expect(isValidContainerCode(c.code)).toBe(true);
      expect(c).toMatchObject({ quantity: 250.5, remaining: 250.5, status: 'sealed', location: 'Cabinet A2', lotId: body.lot.id });
    }
    expect(new Set(body.containers.map((c) => c.code)).size).toBe(3);

    const free = await newMaterial(as(admin), { requiresInspection: false });
    const released = await receive(as(admin), { materialId: free.id, supplierId: supplier.id, containers: 1 });
    expect(released.lot.status).toBe('released');

    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, body.lot.id), eq(auditLog.action, 'lot.receive')));
    expect(audit.actorId).toBe(clerk.id);
    expect(audit.after).toMatchObject({ supplierLot: 'B-2291', status: 'on_hold' });
    expect((audit.after as { containers: { code: string }[] }).containers.map((c) => c.code)).toEqual(body.containers.map((c) => c.code));
  });

  it('asks before receiving the same supplier lot of a material twice (409 DUPLICATE_LOT), then receives on confirmation', async () => {
    const supplier = await newSupplier(as(admin));
    const material = await newMaterial(as(admin));
    const lotNo = `DL-${uniq()}`;
    const first = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, supplierLot: lotNo });
    const before = await counts();
    const dup = await as(clerk).post('/api/lots', {
      materialId: material.id,
      supplierId: supplier.id,
      supplierLot: ` ${lotNo.toLowerCase()} `,
      containers: 1,
      quantityPerContainer: 5,
    });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('DUPLICATE_LOT');
    const details = duplicateLotDetailsSchema.parse(dup.body.error.details);
    expect(details.existingLot).toMatchObject({ id: first.lot.id, supplierLot: lotNo, containerCount: 2, supplierName: supplier.name });
    expect(await counts()).toEqual(before);

    const other = await newMaterial(as(admin));
    expect(
      (
        await as(clerk).post('/api/lots', {
          materialId: other.id,
          supplierId: supplier.id,
          supplierLot: lotNo,
          containers: 1,
          quantityPerContainer: 5,
        })
      ).status,
    ).toBe(201);

    const confirmed = await as(clerk).post('/api/lots', {
      materialId: material.id,
      supplierId: supplier.id,
      supplierLot: lotNo,
      containers: 1,
      quantityPerContainer: 5,
      confirmDuplicate: true,
    });
    expect(confirmed.status).toBe(201);
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, confirmed.body.lot.id), eq(auditLog.action, 'lot.receive')));
    expect(audit.after).toMatchObject({ duplicateConfirmed: true, duplicateOf: [first.lot.id] });
  });

  it('refuses invalid input naming the field, and changes nothing', async () => {
    const supplier = await newSupplier(as(admin));
    const gtin = randomGtin();
    const material = await newMaterial(as(admin), { gtin });
    const ok = { materialId: material.id, supplierId: supplier.id, supplierLot: 'F-1', containers: 2, quantityPerContainer: 10 };
    const future = new Date(Date.now() + 60 * 60_000).toISOString();
    const cases: [Record<string, unknown>, string][] = [
      [{ containers: 0 }, 'containers'],
      [{ containers: 501 }, 'containers'],
      [{ containers: 2.5 }, 'containers'],
      [{ quantityPerContainer: 0 }, 'quantityPerContainer'],
      [{ quantityPerContainer: 1.0005 }, 'quantityPerContainer'],
      [{ quantityPerContainer: '10' }, 'quantityPerContainer'],
      [{ supplierLot: '   ' }, 'supplierLot'],
      [{ manufacturedOn: '2026-03-10', expiresOn: '2026-03-09' }, 'expiresOn'],
      [{ expiresOn: '2026-02-30' }, 'expiresOn'],
      [{ receivedAt: future }, 'receivedAt'],
      [{ receivedAt: '2026-01-20 09:30' }, 'receivedAt'],
      [{ materialId: 'glue' }, 'materialId'],
      [{ materialId: undefined }, 'materialId'],
      [{ materialId: crypto.randomUUID() }, 'materialId'],
      [{ supplierId: crypto.randomUUID() }, 'supplierId'],
      // GS1 example GTIN 09506000134352 (references.md) with its check digit changed.
      [{ gtin: '09506000134353' }, 'gtin'],
    ];
    const before = await counts();
    for (const [change, field] of cases) {
      const res = await as(clerk).post('/api/lots', { ...ok, ...change });
      expect(res.status, JSON.stringify(change)).toBe(400);
      expect(fields(res.body), JSON.stringify(change)).toContain(field);
    }
    const otherGtin = randomGtin();
    await newMaterial(as(admin), { gtin: otherGtin });
    const wrong = await as(clerk).post('/api/lots', { ...ok, gtin: otherGtin });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.code).toBe('WRONG_MATERIAL');
    const malformed = await as(clerk).post('/api/lots', undefined, { raw: '{"materialId": ' });
    expect(malformed.status).toBe(400);
    expect(await counts()).toEqual(before);
    // A GTIN-13 is the same GTIN as its 14-digit form with a leading zero (GS1 General Specifications).
    const as13 = await as(clerk).post('/api/lots', { ...ok, gtin: gtin.slice(1) });
    expect(as13.status).toBe(201);
    expect(as13.body.lot.gtin).toBe(gtin);
  });

  it('401 without a session, 403 for roles that do not receive; retired material or supplier → 409', async () => {
    const supplier = await newSupplier(as(admin));
    const material = await newMaterial(as(admin));
    const body = { materialId: material.id, supplierId: supplier.id, supplierLot: 'R-1', containers: 1, quantityPerContainer: 1 };
    expect((await as().post('/api/lots', body)).status).toBe(401);
    expect((await as(assembler).post('/api/lots', body)).status).toBe(403);
    expect((await as(quality).post('/api/lots', body)).status).toBe(403);
    await as(admin).post(`/api/materials/${material.id}/retire`);
    const retired = await as(clerk).post('/api/lots', body);
    expect(retired.status).toBe(409);
    expect(retired.body.error.code).toBe('MATERIAL_RETIRED');
    await as(admin).patch(`/api/materials/${material.id}`, { active: true });
    await as(admin).post(`/api/suppliers/${supplier.id}/retire`);
    const gone = await as(clerk).post('/api/lots', body);
    expect(gone.status).toBe(409);
    expect(gone.body.error.code).toBe('SUPPLIER_RETIRED');
    expect(await db.select().from(lots).where(eq(lots.materialId, material.id))).toHaveLength(0);
  });

  it('gives every container a distinct code across many receipts', async () => {
    const supplier = await newSupplier(as(admin));
    const material = await newMaterial(as(admin));
    const big = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, containers: 500, quantityPerContainer: 1 });
    expect(big.containers).toHaveLength(500);
    const codes = big.containers.map((c) => c.code);
    expect(new Set(codes).size).toBe(500);
    const stored = await db.select({ code: containers.code }).from(containers).where(eq(containers.lotId, big.lot.id));
    expect(stored.map((r) => r.code).sort()).toEqual([...codes].sort());
  });
});
