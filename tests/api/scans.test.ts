import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '../../server/db/client';
import { materials } from '../../server/db/schema';
import { containerCodeFromBody, crockfordCheckSymbol } from '../../shared/schemas/containers';
import { containerScanResultSchema, gs1ScanResultSchema } from '../../shared/schemas/scans';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, newSupplier, randomGtin, receive } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let assembler: TestUser;
let code: string;
let containerId: string;
let lotId: string;
let materialId: string;
beforeAll(async () => {
  app = await startApp();
  [admin, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['assembler'])]);
  const clerk = await ensureUser(['receiving']);
  const supplier = await newSupplier(as(admin));
  const material = await newMaterial(as(admin), { hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H317'] } });
  const receipt = await receive(as(clerk), { materialId: material.id, supplierId: supplier.id, containers: 2 });
  code = receipt.containers[1].code;
  containerId = receipt.containers[1].id;
  lotId = receipt.lot.id;
  materialId = material.id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const resolve = (c: unknown) => as(assembler).post('/api/scans/resolve', { code: c });

describe('scanning a container label', () => {
  it('resolves the code, also typed sloppily, framed by a keyboard wedge or wrapped in a URL', async () => {
    const body = code.slice(4);
    const forms = [
      code,
      `${code}\r\n`,
      `  ${code}\t`,
      `]Q1${code}\r`, // QR symbology identifier (ISO/IEC 15424)
      `\u0002${code}\u0003`,
      code.toLowerCase(),
      `tlc${body}`,
      `TLC-${body.slice(0, 4)} ${body.slice(4)}`,
      `https://tacklog.plant.example/c/${code}`,
      `https://tacklog.plant.example/scan?c=${encodeURIComponent(code)}`,
      `https://id.plant.example/01/09521234543213/21/${code}`,
    ];
    for (const form of forms) {
      const res = await resolve(form);
      expect(res.status, JSON.stringify(form)).toBe(200);
      const r = containerScanResultSchema.parse(res.body);
      expect(r.container.id).toBe(containerId);
      expect(r.lot.id).toBe(lotId);
      expect(r.material).toMatchObject({ id: materialId, hazards: { pictograms: ['GHS07'] } });
    }
  });

  it('Crockford look-alikes are read as digits (O→0, I/L→1)', async () => {
    // Crockford's Base32: "i" and "l" decode as 1, "o" as 0 (crockford.com/base32.html).
    const withOnes = containerCodeFromBody('1100Z9QW');
    const typed = withOnes.replace('1', 'l').replace('1', 'I').replace('0', 'o');
    const res = await resolve(typed);
    expect(res.status).toBe(404); // well-formed, valid check symbol, just not on record
    expect(res.body.error.message).toContain(withOnes);
  });

  it('400 for a wrong check symbol, 404 for an unknown code', async () => {
    const body = code.slice(4, 12);
    const check = code[12];
    const wrong = `TLC-${body}${check === 'Z' ? 'Y' : 'Z'}`;
    const bad = await resolve(wrong);
    expect(bad.status).toBe(400);
    expect(fields(bad.body)).toEqual(['code']);
    const unknownBody = body === '00000000' ? '00000001' : '00000000';
    const unknown = await resolve(`TLC-${unknownBody}${crockfordCheckSymbol(unknownBody)}`);
    expect(unknown.status).toBe(404);
    expect((await resolve('HELLO-WORLD')).status).toBe(404);
  });
});

describe('scanning a supplier GS1 code', () => {
  // Examples from references.md: GS1 General Specifications and GS1 Digital Link URI syntax 1.2.
  const expected = { gtin: '09521234543213', lot: 'ABC123', expiresOn: '2026-12-31' };

  it('reads element strings with parentheses, raw with GS, with a symbology identifier, and Digital Links', async () => {
    const GS = '\u001d';
    const forms = [
      '(01)09521234543213(17)261231(10)ABC123',
      `0109521234543213${'10ABC123'}${GS}17261231`,
      `]C10109521234543213${'17261231'}10ABC123\r\n`,
      `]d2${GS}010952123454321317261231${'10ABC123'}`,
      'https://id.gs1.org/01/09521234543213/10/ABC123?17=261231',
    ];
    for (const form of forms) {
      const res = await resolve(form);
      expect(res.status, JSON.stringify(form)).toBe(200);
      expect(gs1ScanResultSchema.parse(res.body)).toMatchObject({ type: 'gs1', ...expected });
      // The catalogue may hold this example GTIN from other tests; then its material is named.
      const [holder] = await db.select({ id: materials.id }).from(materials).where(eq(materials.gtin, expected.gtin));
      expect(res.body.materialId).toBe(holder?.id);
    }
  });

  it('reads a raw element string whose first element is not the GTIN (GS1 fixes no order)', async () => {
    // GS1 General Specifications: element strings may come in any order; 17 and 01 are
    // predefined-length, so no GS is needed after them. 280200 = last day of February 2028.
    const gtin = randomGtin();
    const material = await newMaterial(as(admin), { gtin });
    const GS = '\u001d';
    for (const form of [`17280200${'01'}${gtin}10LOT-17`, `10LOT-17${GS}17280200${'01'}${gtin}`, `]C117280200${'01'}${gtin}10LOT-17`]) {
      const res = await resolve(form);
      expect(res.status, JSON.stringify(form)).toBe(200);
      expect(res.body).toMatchObject({ type: 'gs1', gtin, lot: 'LOT-17', expiresOn: '2028-02-29', materialId: material.id });
    }
  });

  it('names the material whose GTIN matches', async () => {
    const gtin = randomGtin();
    const material = await newMaterial(as(admin), { gtin });
    const res = await resolve(`(01)${gtin}(11)260115(10)LOT-7`);
    expect(res.status).toBe(200);
    // Production date 260115 → 2026-01-15 (GS1 General Specifications YYMMDD).
    expect(res.body).toMatchObject({
      type: 'gs1',
      gtin,
      lot: 'LOT-7',
      producedOn: '2026-01-15',
      materialId: material.id,
      materialCode: material.code,
    });
  });

  it('day 00 means the last day of the month', async () => {
    // GS1 General Specifications: 130200 is 2013-02-28.
    const res = await resolve('(01)09521234543213(17)130200');
    expect(res.body.expiresOn).toBe('2013-02-28');
  });

  it('400 naming the field for a wrong check digit or a bad date; 400 for empty; 401 without a session', async () => {
    const digit = await resolve('(01)09521234543214(10)ABC');
    expect(digit.status).toBe(400);
    expect(fields(digit.body)).toEqual(['gtin']);
    const month = await resolve('(01)09521234543213(17)261331');
    expect(month.status).toBe(400);
    expect(fields(month.body)).toEqual(['expiresOn']);
    const dl = await resolve('https://id.gs1.org/01/09521234543214');
    expect(fields(dl.body)).toEqual(['gtin']);
    expect(fields((await resolve(' \r\n')).body)).toEqual(['code']);
    expect(fields((await resolve('')).body)).toEqual(['code']);
    expect(fields((await resolve(42)).body)).toEqual(['code']);
    expect(fields((await as(assembler).post('/api/scans/resolve', {})).body)).toEqual(['code']);
    expect(fields((await resolve('TLC\u0007X')).body)).toEqual(['code']);
    expect((await as().post('/api/scans/resolve', { code })).status).toBe(401);
  });
});
