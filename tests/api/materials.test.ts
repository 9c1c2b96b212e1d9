import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog, materials } from '../../server/db/schema';
import { materialListSchema, materialSchema } from '../../shared/schemas/materials';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, randomGtin, uniq } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let receiving: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, receiving] = await Promise.all([ensureUser(['admin']), ensureUser(['receiving'])]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

const cure = { refTempC: 23, handlingMinutes: 180, fullCureMinutes: 1440, factorPer10C: 2 };

describe('materials: access and input', () => {
  it('401 without a session, 403 for a non-admin, 400 naming the field or param', async () => {
    const body = { code: `M-${uniq()}`, name: 'Slow cap adhesive', kind: 'adhesive', unit: 'g' };
    expect((await as().get('/api/materials')).status).toBe(401);
    expect((await as().post('/api/materials', body)).status).toBe(401);
    expect((await as(receiving).post('/api/materials', body)).status).toBe(403);
    const m = await newMaterial(as(admin));
    expect((await as(receiving).patch(`/api/materials/${m.id}`, { name: 'x' })).status).toBe(403);
    expect((await as(receiving).post(`/api/materials/${m.id}/retire`)).status).toBe(403);

    const badKind = await as(admin).post('/api/materials', { ...body, kind: 'glue' });
    expect(badKind.status).toBe(400);
    expect(fields(badKind.body)).toEqual(['kind']);
    const noCode = await as(admin).post('/api/materials', { ...body, code: undefined });
    expect(noCode.status).toBe(400);
    expect(noCode.body.error.details).toEqual([{ field: 'code', message: 'is required' }]);
    const badId = await as(admin).get('/api/materials/12345');
    expect(badId.status).toBe(400);
    expect(fields(badId.body)).toEqual(['params.id']);
    expect((await as(admin).get(`/api/materials/${crypto.randomUUID()}`)).status).toBe(404);
    expect((await as(admin).get('/api/materials?active=maybe')).status).toBe(400);
  });

  it('names the field of every cross-field rule', async () => {
    const base = { code: `M-${uniq()}`, name: 'Two-part epoxy A', kind: 'adhesive', unit: 'g' };
    const cases: [Record<string, unknown>, string][] = [
      [{ potLifeMinutes: 30, cure }, 'partnerMaterialId'],
      [{ potLifeMinutes: 30, partnerMaterialId: crypto.randomUUID() }, 'cure'],
      [{ cure: { ...cure, handlingMinutes: 2000 } }, 'cure.handlingMinutes'],
      [{ cure: { ...cure, factorPer10C: 1 } }, 'cure.factorPer10C'],
      [{ cure: { ...cure, activationEnergyKJ: 51.2 } }, 'cure.activationEnergyKJ'],
      [{ storageClass: 'frozen' }, 'thawedLifeHours'],
      [{ thawedLifeHours: 4 }, 'thawedLifeHours'],
      [{ outOfStorageAllowanceHours: 24 }, 'outOfStorageAllowanceHours'],
      [{ kind: 'wire', cure }, 'cure'],
      [{ shelfLifeDays: 0 }, 'shelfLifeDays'],
      [{ shelfLifeDays: 1.5 }, 'shelfLifeDays'],
      // gs1.org "How to calculate a check digit manually": 629104150021 → check digit 3.
      [{ gtin: '6291041500214' }, 'gtin'],
      [{ hazards: { pictograms: ['GHS10'], statements: [] } }, 'hazards.pictograms.0'],
      [{ hazards: { pictograms: [], statements: ['X317'] } }, 'hazards.statements.0'],
      [{ hazards: { signalWord: 'Caution', pictograms: [], statements: [] } }, 'hazards.signalWord'],
      [{ orderQuantity: 0 }, 'orderQuantity'],
    ];
    const before = (await db.select({ id: materials.id }).from(materials)).length;
    for (const [extra, field] of cases) {
      const res = await as(admin).post('/api/materials', { ...base, ...extra });
      expect(res.status, JSON.stringify(extra)).toBe(400);
      expect(fields(res.body), JSON.stringify(extra)).toContain(field);
    }
    expect((await db.select({ id: materials.id }).from(materials)).length).toBe(before);
  });
});

describe('materials: create, read, edit, retire', () => {
  it('creates a material with every property (201, numbers as numbers, audited) and reads it back', async () => {
    const code = `ADH-${uniq()}`;
    const gtin = randomGtin();
    const res = await as(admin).post('/api/materials', {
      code,
      name: 'Cyanoacrylate, medium',
      kind: 'adhesive',
      unit: 'g',
      storageClass: 'refrigerated',
      shelfLifeDays: 300,
      openLifeHours: 720,
      outOfStorageAllowanceHours: 72,
      cure: { refTempC: 22, handlingMinutes: 1, fullCureMinutes: 1440, activationEnergyKJ: 51.2 },
      requiresInspection: true,
      hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['h315', 'H319', 'EUH202'] },
      reorderPoint: 400.5,
      orderQuantity: 1000,
      leadTimeDays: 10,
      gtin: gtin.slice(1), // as a GTIN-13: kept as its 14-digit form
    });
    expect(res.status).toBe(201);
    const m = materialSchema.parse(res.body);
    expect(m).toMatchObject({
      code,
      storageClass: 'refrigerated',
      shelfLifeDays: 300,
      openLifeHours: 720,
      outOfStorageAllowanceHours: 72,
      reorderPoint: 400.5,
      orderQuantity: 1000,
      leadTimeDays: 10,
      active: true,
      gtin,
      hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H315', 'H319', 'EUH202'] },
    });
    expect(typeof m.reorderPoint).toBe('number');
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, m.id), eq(auditLog.action, 'material.create')));
    expect(audit).toHaveLength(1);
    expect(audit[0].after).toMatchObject({ code, reorderPoint: 400.5 });

    const got = await as(receiving).get(`/api/materials/${m.id}`);
    expect(got.status).toBe(200);
    expect(got.body).toEqual(res.body);
    const list = materialListSchema.parse((await as(receiving).get('/api/materials?active=true')).body);
    expect(list.items.some((i) => i.id === m.id)).toBe(true);

    const dupGtin = await as(admin).post('/api/materials', { code: `X-${uniq()}`, name: 'Other', kind: 'other', unit: 'pcs', gtin });
    expect(dupGtin.status).toBe(409);
    expect(dupGtin.body.error.code).toBe('DUPLICATE_GTIN');
    const dupCode = await as(admin).post('/api/materials', { code, name: 'Other', kind: 'other', unit: 'pcs' });
    expect(dupCode.status).toBe(409);
    expect(dupCode.body.error.code).toBe('DUPLICATE_CODE');
  });

  it('edits with the rules checked on the merged result, audits old and new values', async () => {
    const m = await newMaterial(as(admin), { shelfLifeDays: 365 });
    const frozen = await as(admin).patch(`/api/materials/${m.id}`, { storageClass: 'frozen' });
    expect(frozen.status).toBe(400);
    expect(fields(frozen.body)).toEqual(['thawedLifeHours']);
    const ok = await as(admin).patch(`/api/materials/${m.id}`, { storageClass: 'frozen', thawedLifeHours: 4, shelfLifeDays: 180 });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ storageClass: 'frozen', thawedLifeHours: 4, shelfLifeDays: 180, name: m.name });
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, m.id), eq(auditLog.action, 'material.update')));
    expect(audit.before).toMatchObject({ storageClass: 'ambient', shelfLifeDays: 365, thawedLifeHours: null });
    expect(audit.after).toMatchObject({ storageClass: 'frozen', shelfLifeDays: 180, thawedLifeHours: 4 });
    expect((await as(admin).patch(`/api/materials/${m.id}`, {})).status).toBe(400);
    const cleared = await as(admin).patch(`/api/materials/${m.id}`, {
      storageClass: 'ambient',
      thawedLifeHours: null,
      shelfLifeDays: null,
    });
    expect(cleared.status).toBe(200);
    expect(cleared.body).toMatchObject({ storageClass: 'ambient', thawedLifeHours: null, shelfLifeDays: null });
  });

  it('retires (inactive, left out of ?active=true) and reinstates', async () => {
    const m = await newMaterial(as(admin));
    const res = await as(admin).post(`/api/materials/${m.id}/retire`);
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);
    const active = (await as(receiving).get('/api/materials?active=true')).body.items.map((i: { id: string }) => i.id);
    expect(active).not.toContain(m.id);
    const retired = (await as(receiving).get('/api/materials?active=false')).body.items.map((i: { id: string }) => i.id);
    expect(retired).toContain(m.id);
    expect(
      await db
        .select()
        .from(auditLog)
        .where(and(eq(auditLog.entityId, m.id), eq(auditLog.action, 'material.retire'))),
    ).toHaveLength(1);
    const back = await as(admin).patch(`/api/materials/${m.id}`, { active: true });
    expect(back.body.active).toBe(true);
  });
});

describe('materials: two-part pairs', () => {
  it('makes pairs mutual, checks kinds, refuses a taken partner and a self pair', async () => {
    const hardener = await newMaterial(as(admin), { kind: 'hardener', name: `Epoxy hardener ${uniq()}` });
    const resin = await newMaterial(as(admin), { partnerMaterialId: hardener.id, potLifeMinutes: 45, cure, mixRatio: 2 });
    expect(resin.partnerMaterialId).toBe(hardener.id);
    expect((await as(admin).get(`/api/materials/${hardener.id}`)).body.partnerMaterialId).toBe(resin.id);

    const wire = await newMaterial(as(admin), { kind: 'wire', unit: 'm' });
    const wrongKind = await as(admin).post('/api/materials', {
      code: `A-${uniq()}`,
      name: 'Resin',
      kind: 'adhesive',
      unit: 'g',
      partnerMaterialId: wire.id,
    });
    expect(wrongKind.status).toBe(400);
    expect(fields(wrongKind.body)).toEqual(['partnerMaterialId']);
    const missing = await as(admin).post('/api/materials', {
      code: `A-${uniq()}`,
      name: 'Resin',
      kind: 'adhesive',
      unit: 'g',
      partnerMaterialId: crypto.randomUUID(),
    });
    expect(missing.status).toBe(400);
    expect(fields(missing.body)).toEqual(['partnerMaterialId']);
    const self = await as(admin).patch(`/api/materials/${resin.id}`, { partnerMaterialId: resin.id });
    expect(self.status).toBe(400);
    expect(fields(self.body)).toEqual(['partnerMaterialId']);
    const taken = await as(admin).post('/api/materials', {
      code: `A-${uniq()}`,
      name: 'Second resin',
      kind: 'adhesive',
      unit: 'g',
      partnerMaterialId: hardener.id,
    });
    expect(taken.status).toBe(409);
    expect(taken.body.error.code).toBe('PARTNER_TAKEN');
  });

  it('re-pairing clears the old partner, but not while it still needs a partner for its pot life', async () => {
    const resin = await newMaterial(as(admin));
    const hardener = await newMaterial(as(admin), { kind: 'hardener', partnerMaterialId: resin.id, potLifeMinutes: 30, cure });
    expect((await as(admin).get(`/api/materials/${resin.id}`)).body.partnerMaterialId).toBe(hardener.id);

    const refused = await as(admin).patch(`/api/materials/${resin.id}`, { partnerMaterialId: null });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('PARTNER_STILL_NEEDED');
    expect((await as(admin).get(`/api/materials/${resin.id}`)).body.partnerMaterialId).toBe(hardener.id);

    const activator = await newMaterial(as(admin), { kind: 'activator' });
    await as(admin).patch(`/api/materials/${hardener.id}`, { potLifeMinutes: null });
    const moved = await as(admin).patch(`/api/materials/${resin.id}`, { partnerMaterialId: activator.id });
    expect(moved.status).toBe(200);
    expect((await as(admin).get(`/api/materials/${hardener.id}`)).body.partnerMaterialId).toBeNull();
    expect((await as(admin).get(`/api/materials/${activator.id}`)).body.partnerMaterialId).toBe(resin.id);
    const relinks = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, hardener.id), eq(auditLog.action, 'material.partner')));
    expect(relinks.at(-1)?.after).toEqual({ partnerMaterialId: null });
  });
});
