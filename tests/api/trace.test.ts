import crypto from 'node:crypto';
import binomialTest from '@stdlib/stats-binomial-test';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csvField, toCsv } from '../../server/services/trace';
import type { Role } from '../../shared/constants';
import { driverTraceSchema, lotStatsSchema, lotTraceSchema, CONTAINMENT_CSV_COLUMNS, type DriverTrace } from '../../shared/schemas/trace';
import { startApp, type TestApp } from '../helpers/api';
import { ensureUser, pinBaseline } from '../helpers/db';
import { buildTraceScenario, type TraceScenario } from '../helpers/trace-scenario';

let app: TestApp;
const tokenFor = async (...roles: Role[]) => (await ensureUser(roles)).token;
/** A raw fetch (the CSV is read as text, headers checked). */
const get = (path: string, token?: string) =>
  fetch(`${app.baseUrl}/api${path}`, { headers: token ? { authorization: `Bearer ${token}` } : {} });

let s: TraceScenario;
let quality: string;

let unpinBaseline: () => Promise<void> = async () => undefined;
beforeAll(async () => {
  unpinBaseline = await pinBaseline(0.01); // the plant default; see pinBaseline
  app = await startApp();
  s = await buildTraceScenario();
  quality = await tokenFor('quality');
});

afterAll(async () => {
  await unpinBaseline();
  await app.close();
});

async function driverTrace(serial: string): Promise<DriverTrace> {
  const res = await get(`/drivers/${encodeURIComponent(serial)}/trace`, quality);
  expect(res.status).toBe(200);
  return driverTraceSchema.parse(await res.json());
}

/** The lots (supplier lot numbers) a trace step used, sorted. */
const lotsOf = (step: DriverTrace['steps'][number]) => step.materials.map((m) => m.supplierLot).sort();

describe('backward trace (GET /api/drivers/:serial/trace)', () => {
  it('lists exactly the lots used at each step, a mix expanded into its resin and hardener lots', async () => {
    const t = await driverTrace(s.batches.b1.serials[0]);
    expect(t.driver.serial).toBe(s.batches.b1.serials[0]);
    expect(t.batch.code).toBe(s.batches.b1.code);
    expect(t.batch.modelCode).toBe(s.modelCode);
    expect(t.steps.map((x) => [x.seq, x.kind])).toEqual([
      [1, 'build'],
      [2, 'build'],
      [3, 'build'],
    ]);
    expect(t.steps.map((x) => x.stepId)).toEqual(s.steps.map((x) => x.id));
    expect(t.steps.map((x) => x.stationCode)).toEqual([s.stations.mag.code, s.stations.mov.code, s.stations.cap.code]);

    const [magnet, moving, cap] = t.steps;
    expect(lotsOf(magnet)).toEqual([s.lots.hard1.supplierLot, s.lots.resin.supplierLot].sort());
    expect(magnet.materials.every((m) => m.via?.mixCode === s.mixCodes.m1)).toBe(true);
    expect(magnet.materials.map((m) => m.via?.part).sort()).toEqual(['hardener', 'resin']);
    expect(magnet.materials.find((m) => m.via?.part === 'resin')?.lotId).toBe(s.lots.resin.id);
    // Two containers of the same CA lot, and the wire.
    expect(lotsOf(moving)).toEqual([s.lots.ca1.supplierLot, s.lots.ca1.supplierLot, s.lots.wire.supplierLot].sort());
    expect(moving.materials.map((m) => m.containerCode).sort()).toEqual(
      [...s.lots.ca1.containerCodes, ...s.lots.wire.containerCodes].sort(),
    );
    expect(moving.materials.every((m) => m.via === undefined)).toBe(true);
    expect(lotsOf(cap)).toEqual([s.lots.cap.supplierLot]);
    for (const step of t.steps) {
      for (const m of step.materials) {
        expect(m.materialId).toBe(Object.values(s.lots).find((l) => l.id === m.lotId)?.materialId);
      }
    }
    expect(t.tests.map((x) => x.result)).toEqual(['pass']);
  });

  it('a reworked driver carries its original genealogy and its rework genealogy', async () => {
    const t = await driverTrace(s.reworkedSerial);
    expect(t.driver.status).toBe('passed');
    expect(t.steps.map((x) => [x.seq, x.kind])).toEqual([
      [1, 'build'],
      [2, 'build'],
      [3, 'build'],
      [2, 'rework'],
    ]);
    const rework = t.steps[3];
    expect(rework.stepRunId).toBe(s.reworkRunId);
    expect(rework.driverId).toBe(t.driver.id);
    expect(lotsOf(rework)).toEqual([s.lots.ca2.supplierLot, s.lots.wire.supplierLot].sort());
    // The original step 2 is still there with the first CA lot.
    expect(lotsOf(t.steps[1])).toContain(s.lots.ca1.supplierLot);
    expect(t.tests.map((x) => [x.result, x.defectCode])).toEqual([
      ['fail', s.defectCodes.active],
      ['pass', null],
    ]);
  });

  it("another unit of the same batch does not get the rework's lot", async () => {
    const t = await driverTrace(s.batches.b1.serials[2]);
    const all = t.steps.flatMap((x) => x.materials.map((m) => m.lotId));
    expect(all).not.toContain(s.lots.ca2.id);
    expect(t.steps.some((x) => x.kind === 'rework')).toBe(false);
  });

  it('shows a step still running with no finish time, and the other mix of batch 2', async () => {
    const t = await driverTrace(s.batches.b2.serials[0]);
    expect(t.steps.map((x) => x.finishedAt === null)).toEqual([false, false, true]);
    expect(lotsOf(t.steps[0])).toEqual([s.lots.hard2.supplierLot, s.lots.resin.supplierLot].sort());
    expect(lotsOf(t.steps[1])).toEqual([s.lots.ca3.supplierLot, s.lots.wire.supplierLot].sort());
  });

  it('401 without a session, 404 for an unknown serial, 400 for a malformed one', async () => {
    expect((await get(`/drivers/${s.reworkedSerial}/trace`)).status).toBe(401);
    const missing = await get(`/drivers/NO-SUCH-${s.sfx}/trace`, quality);
    expect(missing.status).toBe(404);
    expect((await missing.json()).error.code).toBe('NOT_FOUND');
    const bad = await get(`/drivers/${encodeURIComponent('bad serial!')}/trace`, quality);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.details[0].field).toBe('params.serial');
  });

  it('is open to every signed-in role (receiving too)', async () => {
    expect((await get(`/drivers/${s.reworkedSerial}/trace`, await tokenFor('receiving'))).status).toBe(200);
  });
});

describe('forward trace (GET /api/lots/:id/trace)', () => {
  async function lotTrace(lotId: string) {
    const res = await get(`/lots/${lotId}/trace`, quality);
    expect(res.status).toBe(200);
    return lotTraceSchema.parse(await res.json());
  }

  it('a lot used in one batch reaches exactly that batch, with counts by status', async () => {
    const t = await lotTrace(s.lots.ca1.id);
    expect(t.lot.supplierLot).toBe(s.lots.ca1.supplierLot);
    expect(t.drivers.map((d) => d.serial)).toEqual([...s.batches.b1.serials].sort());
    expect(new Set(t.drivers.map((d) => d.batchId))).toEqual(new Set([s.batches.b1.id]));
    expect(t.batches.map((b) => [b.code, b.wholeBatch, b.driverCount])).toEqual([[s.batches.b1.code, true, 4]]);
    expect(t.batches[0].modelCode).toBe(s.modelCode);
    // Unit 1 and 2 passed, 3 failed, 4 scrapped.
    expect(t.counts).toEqual({ total: 4, in_process: 0, passed: 2, failed: 1, reworked: 0, scrapped: 1 });
    expect(t.uses.map((u) => u.containerCode).sort()).toEqual([...s.lots.ca1.containerCodes].sort());
  });

  it('a lot used only in a rework reaches only the reworked driver', async () => {
    const t = await lotTrace(s.lots.ca2.id);
    expect(t.drivers).toEqual([{ serial: s.reworkedSerial, status: 'passed', batchId: s.batches.b1.id }]);
    expect(t.batches.map((b) => [b.code, b.wholeBatch, b.driverCount])).toEqual([[s.batches.b1.code, false, 1]]);
    expect(t.uses.map((u) => [u.kind, u.driverSerial])).toEqual([['rework', s.reworkedSerial]]);
  });

  it('reaches through mixes: the resin lot in both mixes reaches both batches; each hardener lot only its own', async () => {
    const resin = await lotTrace(s.lots.resin.id);
    expect(resin.drivers.map((d) => d.serial)).toEqual([...s.batches.b1.serials, ...s.batches.b2.serials].sort());
    expect(resin.uses.map((u) => u.mixCode).sort()).toEqual([s.mixCodes.m1, s.mixCodes.m2].sort());
    const hard2 = await lotTrace(s.lots.hard2.id);
    expect(hard2.drivers.map((d) => d.serial)).toEqual([...s.batches.b2.serials].sort());
    expect(hard2.counts.in_process).toBe(3);
  });

  it('a lot never used reaches nothing', async () => {
    const t = await lotTrace(s.lots.unused.id);
    expect(t.drivers).toEqual([]);
    expect(t.batches).toEqual([]);
    expect(t.counts.total).toBe(0);
  });

  it('401 without a session, 404 for an unknown lot, 400 for a malformed id', async () => {
    expect((await get(`/lots/${s.lots.ca1.id}/trace`)).status).toBe(401);
    expect((await get(`/lots/${s.lots.ca1.id}/trace.csv`)).status).toBe(401);
    expect((await get(`/lots/${crypto.randomUUID()}/trace`, quality)).status).toBe(404);
    expect((await get(`/lots/${crypto.randomUUID()}/trace.csv`, quality)).status).toBe(404);
    const bad = await get('/lots/not-an-id/trace', quality);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.details[0].field).toBe('params.id');
    expect((await get('/lots/not-an-id/trace.csv', quality)).status).toBe(400);
  });
});

/** A reader for RFC 4180 text (quoted fields, doubled quotes, CRLF records), written from the RFC's grammar. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let i = 0;
  let quoted = false;
  while (i < text.length) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i += 2;
        continue;
      }
      if (ch === '"') {
        quoted = false;
        i += 1;
        continue;
      }
      field += ch;
      i += 1;
      continue;
    }
    if (ch === '"') {
      quoted = true;
      i += 1;
      continue;
    }
    if (ch === ',') {
      row.push(field);
      field = '';
      i += 1;
      continue;
    }
    if (ch === '\r' && text[i + 1] === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      i += 2;
      continue;
    }
    field += ch;
    i += 1;
  }
  if (field !== '' || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}

describe('containment list (GET /api/lots/:id/trace.csv)', () => {
  it('escapes fields per RFC 4180 §2 (quotes around comma, quote, CR/LF; inner quotes doubled; CRLF records)', () => {
    // RFC 4180 §2 rule 6: fields containing line breaks, double quotes and commas are enclosed in double quotes.
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('line1\nline2')).toBe('"line1\nline2"');
    // RFC 4180 §2 rule 7: a double quote inside a quoted field is escaped by preceding it with another.
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    // RFC 4180 §2 rules 1-2: each record ends with CRLF (the last one may).
    expect(
      toCsv([
        ['a', 'b'],
        ['c', null],
      ]),
    ).toBe('a,b\r\nc,\r\n');
    // OWASP "CSV Injection": a cell a spreadsheet would evaluate is prefixed with an apostrophe.
    expect(csvField('=SUM(A1)')).toBe("'=SUM(A1)");
    expect(parseCsv(toCsv([['x,y', 'q"q', 'n\r\nl']]))).toEqual([['x,y', 'q"q', 'n\r\nl']]);
  });

  it('lists every driver reached, per use, with a filename and text/csv', async () => {
    const res = await get(`/lots/${s.lots.ca1.id}/trace.csv`, quality);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv; charset=utf-8/);
    const disposition = res.headers.get('content-disposition') ?? '';
    expect(disposition).toMatch(/^attachment; filename="?containment-[A-Za-z0-9._-]+\.csv"?$/);
    expect(disposition).toContain(s.lots.ca1.supplierLot);
    const text = await res.text();
    expect(text.endsWith('\r\n')).toBe(true);
    const [header, ...rows] = parseCsv(text);
    expect(header).toEqual([...CONTAINMENT_CSV_COLUMNS]);
    // Four drivers × the two containers of the lot used on step 2.
    expect(rows).toHaveLength(8);
    expect([...new Set(rows.map((r) => r[0]))]).toEqual([...s.batches.b1.serials].sort());
    for (const r of rows) {
      expect(r[2]).toBe(s.batches.b1.code);
      expect(r[3]).toBe(s.modelCode);
      expect(r[4]).toBe('2 Moving parts');
      expect(r[5]).toBe(s.stations.mov.code);
      // Plant time as people read it elsewhere (shared/plant-time.ts): 2026-12-02 07:25.
      expect(r[6]).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/);
      expect(s.lots.ca1.containerCodes).toContain(r[7]);
    }
    const json = lotTraceSchema.parse(await (await get(`/lots/${s.lots.ca1.id}/trace`, quality)).json());
    const statusBySerial = new Map(json.drivers.map((d) => [d.serial, d.status]));
    for (const r of rows) expect(r[1]).toBe(statusBySerial.get(r[0]));
  });

  it('a rework-only lot gives one row; the wire lot gives a row per driver per run', async () => {
    const one = parseCsv(await (await get(`/lots/${s.lots.ca2.id}/trace.csv`, quality)).text());
    expect(one.slice(1).map((r) => [r[0], r[4]])).toEqual([[s.reworkedSerial, '2 Moving parts']]);
    const wire = parseCsv(await (await get(`/lots/${s.lots.wire.id}/trace.csv`, quality)).text()).slice(1);
    // B1 step 2 (4 drivers) + B2 step 2 (3 drivers) + the rework of unit 2.
    expect(wire).toHaveLength(4 + 3 + 1);
    expect(wire.filter((r) => r[0] === s.reworkedSerial)).toHaveLength(2);
  });
});

describe('lot statistics (GET /api/lots/stats)', () => {
  it('counts drivers built, tested and failed per lot from whole-batch runs, and flags the suspect lot', async () => {
    const ca = s.lots.ca1.materialId;
    const res = await get(`/lots/stats?materialId=${ca}&days=30`, quality);
    expect(res.status).toBe(200);
    const stats = lotStatsSchema.parse(await res.json());
    const byLot = new Map(stats.items.map((i) => [i.lotId, i]));
    // The CA lots of the scenario: ca1 built batch 1 (4 units; 3 tested, units 2 and 3 failed; unit 4 scrapped untested),
    // ca2 was used only in a rework (not counted: the failure came first), ca3 built batch 2 (untested), unused nothing.
    expect([...byLot.keys()].sort()).toEqual([s.lots.ca1.id, s.lots.ca2.id, s.lots.ca3.id, s.lots.unused.id].sort());
    const ca1 = byLot.get(s.lots.ca1.id)!;
    expect(ca1).toMatchObject({ driversBuilt: 4, tested: 3, failures: 2 });
    expect(ca1.failureRate).toBeCloseTo(2 / 3, 12);
    expect(byLot.get(s.lots.ca2.id)).toMatchObject({ driversBuilt: 0, tested: 0, failures: 0, failureRate: null, flagged: false });
    expect(byLot.get(s.lots.ca3.id)).toMatchObject({ driversBuilt: 3, tested: 0, flagged: false });
    // Reference: @stdlib/stats-binomial-test (a port of R's binom.test), one-sided "greater" against the baseline.
    const ref = binomialTest(2, 3, { p: stats.baseline, alternative: 'greater' }) as unknown as { pValue: number };
    expect(ca1.pValue).toBeCloseTo(ref.pValue, 12);
    // Only ca1 has tested drivers, so Benjamini-Hochberg over one test leaves q = p (Benjamini & Hochberg, 1995).
    expect(ca1.qValue).toBeCloseTo(ca1.pValue, 12);
    // p-chart UCL (Montgomery §7.3): p + 3·sqrt(p(1-p)/n) for n = 3.
    const ucl = stats.baseline + 3 * Math.sqrt((stats.baseline * (1 - stats.baseline)) / 3);
    expect(ca1.aboveUcl).toBe(2 / 3 > ucl);
    expect(ca1.flagged).toBe(ca1.qValue <= stats.q || ca1.aboveUcl);
    expect(stats.items[0].lotId).toBe(s.lots.ca1.id);

    const onlyFlagged = lotStatsSchema.parse(await (await get(`/lots/stats?materialId=${ca}&flaggedOnly=true`, quality)).json());
    expect(onlyFlagged.items.every((i) => i.flagged)).toBe(true);
  });

  it('401 without a session; 400 naming a bad query field', async () => {
    expect((await get('/lots/stats')).status).toBe(401);
    const bad = await get('/lots/stats?days=0', quality);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.details[0].field).toBe('query.days');
    expect((await get('/lots/stats?materialId=nope', quality)).status).toBe(400);
  });
});
