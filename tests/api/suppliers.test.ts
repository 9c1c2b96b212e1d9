import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { auditLog } from '../../server/db/schema';
import { supplierListSchema, supplierSchema } from '../../shared/schemas/suppliers';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, uniq } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let purchasing: TestUser;
let assembler: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, purchasing, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['purchasing']), ensureUser(['assembler'])]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

describe('suppliers', () => {
  it('401 without a session, 403 for a role that may not edit, 400 naming the field', async () => {
    expect((await as().get('/api/suppliers')).status).toBe(401);
    expect((await as().post('/api/suppliers', { name: 'Dunmere Wire' })).status).toBe(401);
    expect((await as(assembler).post('/api/suppliers', { name: 'Dunmere Wire' })).status).toBe(403);
    expect((await as(assembler).get('/api/suppliers')).status).toBe(200);
    const noName = await as(admin).post('/api/suppliers', { email: 'a@b.example' });
    expect(noName.status).toBe(400);
    expect(noName.body.error.details).toEqual([{ field: 'name', message: 'is required' }]);
    const badMail = await as(admin).post('/api/suppliers', { name: `Dunmere ${uniq()}`, email: 'not-mail' });
    expect(badMail.status).toBe(400);
    expect(fields(badMail.body)).toEqual(['email']);
    const badCode = await as(admin).post('/api/suppliers', { name: `Dunmere ${uniq()}`, code: 'has space' });
    expect(fields(badCode.body)).toEqual(['code']);
    expect(fields((await as(admin).patch('/api/suppliers/xyz', { name: 'x' })).body)).toEqual(['params.id']);
  });

  it('purchasing creates (code derived from the name), lists, edits; duplicate names are refused whatever the case', async () => {
    const name = `Ostv ${uniq()}`; // short: the derived code keeps the random part, so it is not taken
    const res = await as(purchasing).post('/api/suppliers', { name, contactName: 'Ines Varro', email: 'desk@ostvale.example' });
    expect(res.status).toBe(201);
    const s = supplierSchema.parse(res.body);
    expect(s.code).toBe(
      `SUP-${name
        .toUpperCase()
        .replace(/[^A-Z0-9]/g, '')
        .slice(0, 12)}`,
    );
    expect(s).toMatchObject({ name, contactName: 'Ines Varro', active: true });
    const again = await as(admin).post('/api/suppliers', { name: name.toLowerCase() });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('DUPLICATE_NAME');

    const list = supplierListSchema.parse((await as(assembler).get('/api/suppliers')).body);
    expect(list.items.some((i) => i.id === s.id)).toBe(true);

    const patched = await as(admin).patch(`/api/suppliers/${s.id}`, { phone: '+00 555 0100', notes: '' });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ phone: '+00 555 0100', notes: null, name });
    const [audit] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.entityId, s.id), eq(auditLog.action, 'supplier.update')));
    expect(audit.before).toMatchObject({ phone: null });
    expect(audit.after).toMatchObject({ phone: '+00 555 0100' });
  });

  it('retires and reinstates; a derived code gets a suffix when taken', async () => {
    const base = `Hg ${uniq()}`; // short, so the derived code keeps the whole random part
    const a = (await as(admin).post('/api/suppliers', { name: `${base} A` })).body;
    const b = (await as(admin).post('/api/suppliers', { name: `${base} a!` })).body;
    expect(b.code).toBe(`${a.code}-2`);
    const retired = await as(purchasing).post(`/api/suppliers/${a.id}/retire`);
    expect(retired.body.active).toBe(false);
    const ids = (await as(admin).get('/api/suppliers?active=true')).body.items.map((i: { id: string }) => i.id);
    expect(ids).not.toContain(a.id);
    expect((await as(admin).patch(`/api/suppliers/${a.id}`, { active: true })).body.active).toBe(true);
  });
});
