/**
 * `?format=csv` on the lists people take to a spreadsheet: lots, alerts, batches, readings and
 * the audit trail. Each CSV must hold exactly the rows of the same filtered JSON list (every
 * page of it), in words rather than codes, with times in plant time and the zone in the header,
 * RFC 4180 framing (read back with csv-parse), formula cells guarded (OWASP "CSV Injection"),
 * and the same access as the list.
 *
 * The plant zone here is Asia/Kathmandu (UTC+05:45 all year, IANA time zone database), so a
 * time written in UTC or in the machine's zone by mistake cannot pass for plant time.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';

vi.hoisted(() => {
  process.env.TACKLOG_PLANT_ZONE = 'Asia/Kathmandu';
});

import { eq, sql } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { DateTime } from 'luxon';
import { db } from '../../server/db/client';
import { alerts, lots, settings } from '../../server/db/schema';
import { ROLES, type Role } from '../../shared/constants';
import { api, startApp, type ApiResponse, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createModel,
  createReading,
  createStation,
  createStationReading,
  createSupplier,
  sfx,
} from '../helpers/fixtures';

const ZONE = 'Asia/Kathmandu';
let app: TestApp;
const users = new Map<Role, TestUser>();
const as = (role?: Role) => api(app.baseUrl, role ? users.get(role)?.token : undefined);

/** The same instant in Kathmandu, computed here with luxon from the IANA data (not with the app's formatter). */
const kathmandu = (iso: string | Date) =>
  DateTime.fromJSDate(typeof iso === 'string' ? new Date(iso) : iso)
    .setZone(ZONE)
    .toFormat('yyyy-MM-dd HH:mm');

interface Csv {
  header: string[];
  rows: Record<string, string>[];
  raw: string;
}

/** Checks the framing every export shares and reads the file back with csv-parse (strict RFC 4180). */
function readCsv(res: ApiResponse, list: string): Csv {
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  expect(res.headers.get('content-type')).toMatch(/^text\/csv; charset=utf-8/);
  const today = DateTime.now().setZone(ZONE).toFormat('yyyy-MM-dd');
  expect(res.headers.get('content-disposition')).toBe(`attachment; filename="tacklog-${list}-${today}.csv"`);
  const raw = res.body as string;
  // RFC 4180 §2 rules 1–2: every record, the last one too, ends with CRLF.
  expect(raw.endsWith('\r\n')).toBe(true);
  const records = parse(raw, { record_delimiter: '\r\n', relax_quotes: false, relax_column_count: false }) as string[][];
  const [header, ...rows] = records;
  return { header, rows: rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]]))), raw };
}

/** Every page of a JSON list (offset paging), to compare with the one CSV. */
async function allPages<T>(role: Role, path: string, pageSize = 100): Promise<T[]> {
  const out: T[] = [];
  for (let offset = 0; ; offset += pageSize) {
    const res = await as(role).get(`${path}${path.includes('?') ? '&' : '?'}limit=${pageSize}&offset=${offset}`);
    expect(res.status).toBe(200);
    out.push(...(res.body.items as T[]));
    if (res.body.items.length < pageSize) return out;
  }
}

const INJECTION = `=HYPERLINK("http://example.invalid/x","open")`;
let material: Awaited<ReturnType<typeof createMaterial>>;
let lotA: Awaited<ReturnType<typeof createLot>>;
let lotB: Awaited<ReturnType<typeof createLot>>;
let lotC: Awaited<ReturnType<typeof createLot>>;
const NOTES = 'Keep cold, "really"\r\nShelf B\nrow 3';

beforeAll(async () => {
  app = await startApp();
  for (const role of ROLES) users.set(role, await ensureUser([role]));
  material = await createMaterial();
  const supplier = await createSupplier(`${INJECTION} ${sfx()}`);
  lotA = await createLot({
    materialId: material.id,
    supplierId: supplier.id,
    status: 'released',
    receivedAt: new Date('2026-03-04T15:30:00Z'),
  });
  lotB = await createLot({
    materialId: material.id,
    supplierId: supplier.id,
    status: 'released',
    receivedAt: new Date('2026-03-05T18:20:00Z'),
  });
  lotC = await createLot({
    materialId: material.id,
    supplierId: supplier.id,
    status: 'on_hold',
    receivedAt: new Date('2026-03-06T08:00:00Z'),
  });
  await db.update(lots).set({ notes: NOTES }).where(eq(lots.id, lotB.id));
});
afterAll(() => app.close());

describe('GET /api/lots?format=csv', () => {
  it('holds exactly the filtered list, every page, in the screen order, with words and plant time', async () => {
    const filter = `materialId=${material.id}&status=released&sort=receivedAt&dir=asc`;
    const json = await allPages<{ supplierLot: string }>('receiving', `/api/lots?${filter}`, 1);
    expect(json.map((l) => l.supplierLot)).toEqual([lotA.supplierLot, lotB.supplierLot]);
    // limit and offset are the screen's page; the export holds every matching row regardless.
    const csv = readCsv(await as('receiving').get(`/api/lots?${filter}&limit=1&offset=1&format=csv`), 'lots');
    expect(csv.rows.map((r) => r['Supplier lot'])).toEqual(json.map((l) => l.supplierLot));

    expect(csv.header).toContain(`Received (plant time, ${ZONE})`);
    const [a, b] = csv.rows;
    // 15:30 UTC is 21:15 in Kathmandu (UTC+05:45, IANA tz database); 18:20 UTC is 00:05 the next day.
    expect(a[`Received (plant time, ${ZONE})`]).toBe('2026-03-04 21:15');
    expect(b[`Received (plant time, ${ZONE})`]).toBe('2026-03-06 00:05');
    expect(a.Status).toBe('Released');
    expect(a['Material code']).toBe(material.code);
    // Commas, quotes and line breaks come back whole (RFC 4180 §2 rules 6–7).
    expect(b.Notes).toBe(NOTES);
    // OWASP "CSV Injection": the supplier's name starting with "=" is not a formula any more.
    expect(a.Supplier.startsWith(`'${INJECTION}`)).toBe(true);
    expect(csv.raw).not.toMatch(/(^|,)=HYPERLINK/m);
  });

  it('says on hold in words and keeps the same filters as the list (status on_hold)', async () => {
    const csv = readCsv(await as('quality').get(`/api/lots?materialId=${material.id}&status=on_hold&format=csv`), 'lots');
    expect(csv.rows.map((r) => [r['Supplier lot'], r.Status])).toEqual([[lotC.supplierLot, 'On hold']]);
  });

  it('400 naming query.format for an unknown format; 401 without a session', async () => {
    const bad = await as('quality').get('/api/lots?format=xlsx');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { field: string }) => d.field)).toEqual(['query.format']);
    expect((await as().get('/api/lots?format=csv')).status).toBe(401);
  });

  it('refuses more rows than one export may hold (409 EXPORT_TOO_LARGE, setting csvExportMaxRows) before sending any', async () => {
    await db
      .insert(settings)
      .values({ key: 'csvExportMaxRows', value: 1 })
      .onConflictDoUpdate({ target: settings.key, set: { value: 1 } });
    try {
      const res = await as('quality').get(`/api/lots?materialId=${material.id}&format=csv`);
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('EXPORT_TOO_LARGE');
      expect(res.body.error.details).toEqual({ total: 3, max: 1 });
      // The list itself is not capped.
      expect((await as('quality').get(`/api/lots?materialId=${material.id}`)).body.total).toBe(3);
    } finally {
      await db.delete(settings).where(eq(settings.key, 'csvExportMaxRows'));
    }
    expect((await as('quality').get(`/api/lots?materialId=${material.id}&format=csv`)).status).toBe(200);
  });
});

describe('GET /api/alerts?format=csv', () => {
  let qualityAlertMessage: string;
  beforeAll(async () => {
    qualityAlertMessage = `${INJECTION} lot ${sfx()} expires soon`;
    await db.insert(alerts).values([
      {
        kind: 'expiring_soon',
        severity: 'warning',
        subjectType: 'lot',
        subjectId: lotA.id,
        message: qualityAlertMessage,
        audience: ['quality'],
        raisedAt: new Date('2026-03-04T23:59:00Z'),
        data: { detail: 'Expires in 3 days, 2 containers' },
      },
      {
        kind: 'expiring_soon',
        severity: 'info',
        subjectType: 'lot',
        subjectId: lotB.id,
        message: `Lot ${sfx()} expires in 10 days`,
        audience: ['purchasing'],
        state: 'acknowledged',
        acknowledgedAt: new Date('2026-03-05T01:00:00Z'),
      },
    ]);
  });

  it('holds exactly the alerts the same filters list for this person, in words, plant time, guarded', async () => {
    for (const role of ['quality', 'purchasing', 'admin'] as const) {
      const json = await allPages<{ message: string }>(role, '/api/alerts?kind=expiring_soon&state=live');
      const csv = readCsv(await as(role).get('/api/alerts?kind=expiring_soon&state=live&format=csv'), 'alerts');
      // Guarded cells read with their apostrophe; the text after it is the list's message.
      expect(
        csv.rows.map((r) => r.Message.replace(/^'(?==)/, '')),
        role,
      ).toEqual(json.map((a) => a.message));
      expect(csv.rows.some((r) => r.Message === `'${qualityAlertMessage}`)).toBe(role !== 'purchasing');
    }
    const csv = readCsv(await as('quality').get('/api/alerts?kind=expiring_soon&state=live&format=csv'), 'alerts');
    const mine = csv.rows.find((r) => r.Message === `'${qualityAlertMessage}`);
    expect(mine).toMatchObject({
      [`Raised (plant time, ${ZONE})`]: '2026-03-05 05:44', // 23:59 UTC + 05:45
      Severity: 'Warning',
      State: 'Open',
      Kind: 'Lot expiring soon',
      About: 'Lot',
      Detail: 'Expires in 3 days, 2 containers',
    });
  });

  it('alerts sharing one raised time (and one insert) across page ends come once each, newest first', async () => {
    const tag = `tied ${sfx()}`;
    // 1,200 alerts at three raised times, 400 each, written together: page ends (1,000 rows a
    // page) fall inside a tie, which only the id breaks.
    await db.execute(sql`
      INSERT INTO alerts (kind, severity, subject_type, subject_id, message, audience, raised_at)
      SELECT 'lamp_check_due', 'info', 'station', gen_random_uuid()::text, ${tag} || ' #' || n, '{quality}',
             '2025-07-01T00:00:00Z'::timestamptz + ((n % 3) || ' hours')::interval
      FROM generate_series(1, 1200) AS n`);
    const json = await allPages<{ message: string }>('quality', '/api/alerts?kind=lamp_check_due', 500);
    const csv = readCsv(await as('quality').get('/api/alerts?kind=lamp_check_due&format=csv'), 'alerts');
    expect(csv.rows).toHaveLength(json.length);
    const tied = csv.rows.map((r) => r.Message).filter((m) => m.startsWith(tag));
    expect(tied).toHaveLength(1200);
    expect(new Set(tied).size).toBe(1200);
    const raised = csv.rows.map((r) => r[`Raised (plant time, ${ZONE})`]);
    expect(raised).toEqual([...raised].sort().reverse());
  });
});

describe('GET /api/batches?format=csv', () => {
  it('holds exactly the filtered list with status words and plant time', async () => {
    const station = await createStation();
    const model = await createModel({ steps: [{ stationKind: station.kind }] });
    const done = await createBatch({ modelId: model.id, status: 'completed', quantity: 3 });
    await createBatch({ modelId: model.id, status: 'in_process' });
    const json = await allPages<{ code: string; createdAt: string }>('assembler', `/api/batches?modelId=${model.id}`, 1);
    expect(json).toHaveLength(2);
    const csv = readCsv(await as('assembler').get(`/api/batches?modelId=${model.id}&limit=1&format=csv`), 'batches');
    expect(csv.rows.map((r) => r.Batch)).toEqual(json.map((b) => b.code));
    const row = csv.rows.find((r) => r.Batch === done.code);
    expect(row).toMatchObject({ 'Model code': model.code, Drivers: '3', Status: 'Completed' });
    expect(row?.[`Created (plant time, ${ZONE})`]).toBe(kathmandu(done.createdAt));
    const byStatus = readCsv(await as('assembler').get(`/api/batches?modelId=${model.id}&status=in_process&format=csv`), 'batches');
    expect(byStatus.rows.map((r) => r.Status)).toEqual(['In process']);
  });
});

describe('GET /api/readings?format=csv', () => {
  it('holds every reading the filters select (not only the newest `limit`), numbers as numbers', async () => {
    const area = `Press ${sfx()}`;
    await createReading(area, new Date('2026-01-10T06:00:00Z'), -5.5, 40);
    await createReading(area, new Date('2026-01-10T07:00:00Z'), 18.25, 45.5);
    await createReading(area, new Date('2026-01-10T08:15:00Z'), 21);
    await createReading(area, new Date('2026-01-12T08:15:00Z'), 22); // outside the period below
    const period = `area=${encodeURIComponent(area)}&from=2026-01-10T00:00:00.000Z&to=2026-01-11T00:00:00.000Z`;
    const json = (await as('purchasing').get(`/api/readings?${period}&limit=5000`)).body.items as { at: string }[];
    expect(json).toHaveLength(3);
    const limited = (await as('purchasing').get(`/api/readings?${period}&limit=2`)).body.items;
    expect(limited).toHaveLength(2);
    const csv = readCsv(await as('purchasing').get(`/api/readings?${period}&limit=2&format=csv`), 'readings');
    const at = `Taken (plant time, ${ZONE})`;
    expect(csv.rows.map((r) => r[at])).toEqual(json.map((r) => kathmandu(r.at)));
    expect(csv.rows.map((r) => [r[at], r.Area, r['Temperature (°C)'], r['Relative humidity (%)']])).toEqual([
      ['2026-01-10 14:00', area, '21', ''],
      ['2026-01-10 12:45', area, '18.25', '45.5'],
      ['2026-01-10 11:45', area, '-5.5', '40'], // a negative number is a number, not a guarded formula
    ]);
  });

  it('says how a reading came in, in words', async () => {
    const area = `Dock ${sfx()}`;
    expect((await as('assembler').post('/api/readings', { area, at: '2026-01-10T05:00:00.000Z', tempC: 12.5 })).status).toBe(201);
    const csv = readCsv(await as('assembler').get(`/api/readings?area=${encodeURIComponent(area)}&format=csv`), 'readings');
    expect(csv.rows.map((r) => [r.Source, r['Recorded by']])).toEqual([['Entered by hand', users.get('assembler')?.name]]);
  });

  it("names a station's own readings by the station", async () => {
    const oven = await createStation({ cureEnvironment: 'own' });
    await createStationReading(oven.id, new Date('2026-01-10T09:00:00Z'), { tempC: 120 });
    const csv = readCsv(await as('assembler').get(`/api/readings?stationId=${oven.id}&format=csv`), 'readings');
    expect(csv.rows).toHaveLength(1);
    expect(csv.rows[0]).toMatchObject({ Area: '', 'Station (own readings)': `${oven.code} ${oven.name}`, 'Temperature (°C)': '120' });
  });
});

describe('GET /api/audit?format=csv', () => {
  it('holds exactly the filtered entries, actions and changes in words, reasons guarded, seals kept', async () => {
    const reason = `=1+1 "suspect", see bench note`;
    const changed = await as('quality').post(`/api/lots/${lotC.id}/status`, { status: 'quarantined', reason });
    expect(changed.status).toBe(200);
    const filter = `entity=lot&entityId=${lotC.id}`;
    const json = (await as('quality').get(`/api/audit?${filter}`)).body.items as { id: number; at: string; hash: string }[];
    expect(json.length).toBeGreaterThan(0);
    const csv = readCsv(await as('quality').get(`/api/audit?${filter}&limit=1&format=csv`), 'audit');
    expect(csv.rows.map((r) => Number(r.Entry))).toEqual(json.map((e) => e.id));
    const row = csv.rows[0];
    expect(row).toMatchObject({
      Action: 'Status changed',
      'Record type': 'Lot',
      'Record id': lotC.id,
      Reason: `'${reason}`,
      'Seal (SHA-256)': json[0].hash,
      [`Recorded (plant time, ${ZONE})`]: kathmandu(json[0].at),
      Person: users.get('quality')?.name,
    });
    expect(row.Changes).toContain('Status: On hold → Quarantined');
  });

  it('says an alert state change in words, not codes', async () => {
    const [alert] = await db
      .insert(alerts)
      .values({
        kind: 'lamp_check_due',
        severity: 'warning',
        subjectType: 'station',
        subjectId: sfx(),
        message: 'Check the lamp',
        audience: ['quality'],
      })
      .returning();
    expect((await as('quality').post(`/api/alerts/${alert.id}/acknowledge`)).status).toBe(200);
    const csv = readCsv(await as('quality').get(`/api/audit?entity=alert&entityId=${alert.id}&format=csv`), 'audit');
    expect(csv.rows.map((r) => [r.Action, r['Record type'], r.Changes])).toEqual([
      ['Alert acknowledged', 'Alert', 'State: Open → Acknowledged'],
    ]);
  });
});

describe('paging through more rows than one database page (1,000)', () => {
  it('readings: 2,345 rows of one area come once each, newest first', async () => {
    const area = `Long hall ${sfx()}`;
    const start = Date.parse('2025-06-01T00:00:00Z');
    await db.execute(sql`
      INSERT INTO readings (area, at, temp_c, source)
      SELECT ${area}, ${new Date(start).toISOString()}::timestamptz + (n || ' minutes')::interval, 20 + (n % 7), 'logger'
      FROM generate_series(1, 2345) AS n`);
    const csv = readCsv(await as('quality').get(`/api/readings?area=${encodeURIComponent(area)}&format=csv`), 'readings');
    expect(csv.rows).toHaveLength(2345);
    const times = csv.rows.map((r) => r[`Taken (plant time, ${ZONE})`]);
    expect(new Set(times).size).toBe(2345);
    expect(times[0]).toBe(kathmandu(new Date(start + 2345 * 60_000)));
    expect(times.at(-1)).toBe(kathmandu(new Date(start + 60_000)));
  });

  it('readings sharing one time (and one insert) across page ends come once each', async () => {
    const area = `Tied hall ${sfx()}`;
    // 1,200 readings at three times, 400 each, written together: equal time and equal creation
    // time, told apart by id only — page ends fall inside the ties.
    await db.execute(sql`
      INSERT INTO readings (area, at, temp_c, source)
      SELECT ${area}, '2025-07-01T00:00:00Z'::timestamptz + ((n % 3) || ' hours')::interval, n / 10.0, 'logger'
      FROM generate_series(1, 1200) AS n`);
    const csv = readCsv(await as('quality').get(`/api/readings?area=${encodeURIComponent(area)}&format=csv`), 'readings');
    expect(csv.rows).toHaveLength(1200);
    const temps = csv.rows.map((r) => r['Temperature (°C)']);
    expect(new Set(temps).size).toBe(1200);
    const times = csv.rows.map((r) => r[`Taken (plant time, ${ZONE})`]);
    expect(times).toEqual([...times].sort().reverse());
  });

  it('audit: 1,500 entries of one record follow the id downwards, none twice, none left out', async () => {
    const entityId = `bulk-${sfx()}`;
    await db.execute(sql`
      INSERT INTO audit_log (action, entity_type, entity_id, after)
      SELECT 'setting.change', 'setting', ${entityId}, jsonb_build_object('value', n) FROM generate_series(1, 1500) AS n`);
    const csv = readCsv(await as('admin').get(`/api/audit?entityId=${entityId}&format=csv`), 'audit');
    const ids = csv.rows.map((r) => Number(r.Entry));
    expect(ids).toHaveLength(1500);
    expect(ids).toEqual([...ids].sort((a, b) => b - a));
    expect(new Set(ids).size).toBe(1500);
    expect(csv.rows[0]).toMatchObject({ 'Record type': 'Setting', Person: 'Tacklog (automatic)', Changes: 'Value: 1500' });
  });
});

describe('the CSV has the same access as its list', () => {
  it('answers each role the CSV as it answers the JSON list (200 or 403), and 401 without a session', async () => {
    const wrong: string[] = [];
    for (const path of ['/api/lots', '/api/alerts', '/api/batches', '/api/readings', '/api/audit']) {
      if ((await as().get(`${path}?format=csv`)).status !== 401) wrong.push(`${path} without a session`);
      for (const role of ROLES) {
        const list = (await as(role).get(path)).status;
        const csv = await as(role).get(`${path}?format=csv`);
        if (csv.status !== list) wrong.push(`${path} as ${role}: list ${list}, CSV ${csv.status}`);
        if (csv.status === 200 && !(csv.headers.get('content-type') ?? '').startsWith('text/csv'))
          wrong.push(`${path} as ${role}: not CSV`);
      }
    }
    expect(wrong).toEqual([]);
  });
});
