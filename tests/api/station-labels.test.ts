import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import QRCode from 'qrcode';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let assembler: TestUser;
let stationId: string;
const code = `ST-${Date.now().toString(36).toUpperCase()}`;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, assembler] = await Promise.all([ensureUser(['admin']), ensureUser(['receiving']), ensureUser(['assembler'])]);
  const res = await as(admin).post('/api/stations', { code, name: 'Glue bench <2> & dome', kind: 'glue', area: 'Hall A' });
  expect(res.status).toBe(201);
  stationId = res.body.id;
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

describe('station code labels', () => {
  it("prints the station's code as a QR with its code and name in words, in a container label layout", async () => {
    const res = await as(admin).get(`/api/labels/stations?layout=a4-3x8-70x37&stationId=${stationId}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/html/);
    const html: string = res.body;
    // The same page geometry as container labels on that stock.
    expect(html).toContain('@page { size: 210mm 297mm; margin: 0; }');
    expect(html).toContain('grid-template-columns: repeat(3, 70mm)');
    expect(html).toContain(`<div class="code">${code}</div>`);
    expect(html).toContain('Glue bench &lt;2&gt; &amp; dome');
    expect(html).not.toContain('<2> & dome');
    expect(html).toContain(`Station ${code}`);
    expect(html).toContain('Hall A');
    // The QR encodes exactly the station code: the symbol equals the one the qrcode reference library makes for it.
    const reference = await QRCode.toString(code, { type: 'svg', errorCorrectionLevel: 'M', margin: 4 });
    expect(html).toContain(reference);
    expect((html.match(/<section class="page">/g) ?? []).length).toBe(1);
  });

  it('prints copies on thermal labels, one per page, and skips used positions on a sheet', async () => {
    const thermal: string = (await as(clerk).get(`/api/labels/stations?layout=thermal-50x25&stationId=${stationId}&copies=3`)).body;
    expect(thermal).toContain('@page { size: 50mm 25mm; margin: 0; }');
    expect((thermal.match(/<section class="page">/g) ?? []).length).toBe(3);
    const sheet: string = (await as(clerk).get(`/api/labels/stations?layout=a4-3x8-70x37&stationId=${stationId}&skip=23&copies=2`)).body;
    expect((sheet.match(/<section class="page">/g) ?? []).length).toBe(2);
    expect((sheet.match(/class="label empty"/g) ?? []).length).toBe(23);
  });

  it('401, 403, 400 naming the query field, 404 for an unknown station', async () => {
    const q = `layout=a4-3x8-70x37&stationId=${stationId}`;
    expect((await as().get(`/api/labels/stations?${q}`)).status).toBe(401);
    expect((await as(assembler).get(`/api/labels/stations?${q}`)).status).toBe(403);
    const cases: [string, string][] = [
      [`layout=a5&stationId=${stationId}`, 'query.layout'],
      [`stationId=${stationId}`, 'query.layout'],
      ['layout=a4-3x8-70x37', 'query.stationId'],
      ['layout=a4-3x8-70x37&stationId=abc', 'query.stationId'],
      [`${q}&copies=0`, 'query.copies'],
      [`${q}&copies=101`, 'query.copies'],
      [`${q}&skip=24`, 'query.skip'],
    ];
    for (const [query, field] of cases) {
      const res = await as(clerk).get(`/api/labels/stations?${query}`);
      expect(res.status, query).toBe(400);
      expect(fields(res.body), query).toEqual([field]);
    }
    expect((await as(clerk).get(`/api/labels/stations?layout=a4-3x8-70x37&stationId=${crypto.randomUUID()}`)).status).toBe(404);
  });
});
