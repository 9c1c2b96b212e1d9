import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { labelLayoutListSchema } from '../../shared/schemas/labels';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { fields, newMaterial, newSupplier, receive } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let quality: TestUser;
let assembler: TestUser;
let lotId: string;
let codes: string[];
let ids: string[];
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, quality, assembler] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['quality']),
    ensureUser(['assembler']),
  ]);
  const supplier = await newSupplier(as(admin));
  const material = await newMaterial(as(admin), {
    name: `Epoxy <b>"A"</b> & hardener`,
    storageClass: 'refrigerated',
    hazards: { signalWord: 'Danger', pictograms: ['GHS05', 'GHS07'], statements: ['H314', 'H317'] },
  });
  const receipt = await receive(as(clerk), {
    materialId: material.id,
    supplierId: supplier.id,
    supplierLot: 'Q<7>&8',
    containers: 4,
    expiresOn: '2031-05-31',
  });
  lotId = receipt.lot.id;
  codes = receipt.containers.map((c) => c.code);
  ids = receipt.containers.map((c) => c.id);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

describe('label layouts', () => {
  it('lists the layouts to anyone signed in', async () => {
    expect((await as().get('/api/labels/layouts')).status).toBe(401);
    const { items } = labelLayoutListSchema.parse((await as(assembler).get('/api/labels/layouts')).body);
    expect(items.map((l) => l.id).sort()).toEqual(['a4-3x8-70x37', 'letter-3x10-66-7x25-4', 'thermal-100x50', 'thermal-50x25']);
  });
});

describe('label rendering', () => {
  it('renders every container of a lot as print-ready HTML in millimetres, with text escaped and hazards shown', async () => {
    const res = await as(clerk).get(`/api/labels/render?layout=a4-3x8-70x37&lotId=${lotId}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/html/);
    const html: string = res.body;
    expect(html).toContain('@page { size: 210mm 297mm; margin: 0; }');
    expect(html).toContain('grid-template-columns: repeat(3, 70mm)');
    for (const code of codes) expect(html).toContain(`<div class="code">${code}</div>`);
    expect(html).toContain('Epoxy &lt;b&gt;&quot;A&quot;&lt;/b&gt; &amp; hardener');
    expect(html).not.toContain('<b>"A"</b>');
    expect(html).toContain('Lot Q&lt;7&gt;&amp;8');
    expect(html).toContain('Container 4 of 4');
    expect(html).toContain('Keep refrigerated');
    // Supplier expiry 2031-05-31 is usable through that day (plant zone UTC in tests).
    expect(html).toContain('Use by 2031-05-31');
    expect(html).toContain('<title>GHS05 corrosion</title>');
    expect(html).toContain('<title>GHS07 exclamation mark</title>');
    expect(html).toContain('<span class="signal">Danger</span>');
    expect(html).toMatch(/safety data sheet, local regulations and the plant's own safety rules govern/);
    expect((html.match(/<svg xmlns="http:\/\/www.w3.org\/2000\/svg" viewBox="0 0 29 29"/g) ?? []).length).toBe(4);
  });

  it('reprints chosen containers in the order asked, on thermal labels one per page', async () => {
    const res = await as(quality).get(`/api/labels/render?layout=thermal-50x25&containerIds=${ids[2]},${ids[0]}`);
    expect(res.status).toBe(200);
    const html: string = res.body;
    expect(html).toContain('@page { size: 50mm 25mm; margin: 0; }');
    expect((html.match(/<section class="page">/g) ?? []).length).toBe(2);
    expect(html.indexOf(codes[2])).toBeLessThan(html.indexOf(codes[0]));
    expect(html).not.toContain(codes[1]);
    expect((await as(admin).get(`/api/labels/render?layout=letter-3x10-66-7x25-4&lotId=${lotId}&skip=29`)).body).toContain(
      'size: 215.9mm 279.4mm',
    );
  });

  it('401, 403, 400 naming the query field, 404 for unknown records', async () => {
    const q = `layout=a4-3x8-70x37&lotId=${lotId}`;
    expect((await as().get(`/api/labels/render?${q}`)).status).toBe(401);
    expect((await as(assembler).get(`/api/labels/render?${q}`)).status).toBe(403);
    const cases: [string, string][] = [
      [`layout=a5&lotId=${lotId}`, 'query.layout'],
      [`lotId=${lotId}`, 'query.layout'],
      ['layout=a4-3x8-70x37', 'query.lotId'],
      [`layout=a4-3x8-70x37&lotId=${lotId}&containerIds=${ids[0]}`, 'query.containerIds'],
      ['layout=a4-3x8-70x37&containerIds=abc', 'query.containerIds.0'],
      [`layout=a4-3x8-70x37&lotId=${lotId}&skip=24`, 'query.skip'],
      [`layout=a4-3x8-70x37&lotId=${lotId}&skip=-1`, 'query.skip'],
    ];
    for (const [query, field] of cases) {
      const res = await as(clerk).get(`/api/labels/render?${query}`);
      expect(res.status, query).toBe(400);
      expect(fields(res.body), query).toEqual([field]);
    }
    expect((await as(clerk).get(`/api/labels/render?layout=a4-3x8-70x37&lotId=${crypto.randomUUID()}`)).status).toBe(404);
    expect((await as(clerk).get(`/api/labels/render?layout=a4-3x8-70x37&containerIds=${ids[0]},${crypto.randomUUID()}`)).status).toBe(404);
  });
});
