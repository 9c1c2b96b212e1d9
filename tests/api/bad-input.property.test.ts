/**
 * Property-based bad input (fast-check): for every route the Express app registers — listed
 * from the router itself, not by hand — generated bodies, queries, path parameters, content
 * types, scan codes and multipart uploads. Two properties must hold for every request:
 *
 *   1. the answer is never a 5xx;
 *   2. a refusal (4xx) changes no row: the row count and the newest row version (xmin) of every
 *      main table are the same before and after.
 *
 * The user holds every role, so requests get past the role checks to the validation and the
 * plant rules. Real ids of rows made here are mixed into the generated values so that requests
 * also reach deeper than "not found". Set FC_SEED to replay a failing run.
 */
import { sql } from 'drizzle-orm';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { db } from '../../server/db/client';
import { apiRouter } from '../../server/routes';
import { ROLES } from '../../shared/constants';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMix,
  createModel,
  createStation,
  createSupplier,
  createTwoPart,
  minutesAgo,
  sfx,
} from '../helpers/fixtures';
import { pdfBytes } from '../helpers/receiving';

interface Route {
  method: string;
  path: string;
  params: string[];
  upload: boolean;
}

interface Layer {
  name?: string;
  rawPath?: string;
  route?: { path: string; methods: Record<string, boolean>; stack: Layer[] };
  handle?: { stack?: Layer[] };
}

/** Every route under /api, from the router's own layers (Express 5 / router 2). */
function listRoutes(stack: Layer[], prefix = '/api'): Route[] {
  const out: Route[] = [];
  for (const layer of stack) {
    if (layer.route) {
      const path = `${prefix}${layer.route.path}`.replace(/\/$/, '') || '/';
      const params = [...path.matchAll(/:(\w+)/g)].map((m) => m[1]);
      const upload = layer.route.stack.some((l) => l.name === 'acceptUpload');
      for (const method of Object.keys(layer.route.methods)) out.push({ method: method.toUpperCase(), path, params, upload });
    } else if (layer.handle?.stack) {
      const mount = layer.rawPath && layer.rawPath !== '/' ? layer.rawPath : '';
      out.push(...listRoutes(layer.handle.stack, `${prefix}${mount}`));
    }
  }
  return out;
}

const ROUTES = listRoutes((apiRouter as unknown as { stack: Layer[] }).stack);
const STATE_CHANGING = ROUTES.filter((r) => ['POST', 'PUT', 'PATCH', 'DELETE'].includes(r.method));
/**
 * Left out of the generated runs, with the reason: logout would end the session the run uses
 * (its refusals are covered in hardening.test.ts); the compliance run sweeps every table of the
 * shared test database (other files' rows), which is not this file's to change.
 */
const SKIPPED = new Set(['POST /api/auth/logout', 'POST /api/compliance/run']);

/** Field names of every object schema in shared/schemas, so generated bodies use real keys. */
const FIELD_NAMES = (() => {
  const modules = import.meta.glob('../../shared/schemas/*.ts', { eager: true }) as Record<string, Record<string, unknown>>;
  const names = new Set<string>();
  for (const mod of Object.values(modules)) {
    for (const value of Object.values(mod)) {
      if (value instanceof z.ZodObject) for (const key of Object.keys(value.shape as object)) names.add(key);
    }
  }
  return [...names].sort();
})();

/** Main tables whose rows a refused request must leave alone. */
const TABLES = [
  'users',
  'sessions',
  'suppliers',
  'materials',
  'attachments',
  'lots',
  'containers',
  'stations',
  'driver_models',
  'recipe_steps',
  'recipe_step_materials',
  'build_batches',
  'drivers',
  'step_runs',
  'step_run_materials',
  'station_loads',
  'mixes',
  'readings',
  'test_results',
  'defect_codes',
  'deviations',
  'alerts',
  'audit_log',
  'settings',
];

/**
 * Per table, in one round trip: the row count and the newest row version's transaction id
 * (xmin). Any INSERT or UPDATE — even one writing the same values, which a checksum of the
 * contents would miss — makes a row version with a newer xmin; a DELETE changes the count (and
 * a delete plus an insert, the xmin). Cheaper than hashing every row's text, on a shared test
 * database that grows as the other files run.
 */
async function checksum(): Promise<Record<string, string>> {
  const parts = TABLES.map((t) => `(SELECT count(*) || ':' || coalesce(max(xmin::text::bigint), 0) FROM "${t}") AS "${t}"`);
  const result = await db.execute(sql.raw(`SELECT ${parts.join(', ')}`));
  return result.rows[0] as Record<string, string>;
}

let app: TestApp;
let user: TestUser;
const ids: string[] = [];
const codes: string[] = [];

beforeAll(async () => {
  app = await startApp();
  user = await ensureUser([...ROLES], { email: `fuzz-${sfx()}@tacklog.test` });
  // A small plant to aim at: a two-part adhesive, lots and containers, a station, a model, a batch, a mix.
  const epoxy = await createTwoPart({ potLifeMinutes: 60 });
  const supplier = await createSupplier('Fuzz supply');
  const station = await createStation({ kind: `fuzz ${sfx()}` });
  const model = await createModel({
    steps: [{ name: 'Glue', stationKind: station.kind, materials: [{ materialId: epoxy.resin.id, amountPerUnit: 1 }] }],
  });
  const batch = await createBatch({ modelId: model.id, quantity: 2 });
  const resin = await createLot({ materialId: epoxy.resin.id, supplierId: supplier.id, quantity: 500, containers: 2 });
  const hardener = await createLot({ materialId: epoxy.hardener.id, supplierId: supplier.id, quantity: 500 });
  const mix = await createMix({
    stationId: station.id,
    resinContainerId: resin.containers[0].id,
    hardenerContainerId: hardener.containers[0].id,
    mixedAt: minutesAgo(1),
    potLifeEndsAt: new Date(Date.now() + 3600_000),
  });
  ids.push(
    epoxy.resin.id,
    epoxy.hardener.id,
    supplier.id,
    station.id,
    model.id,
    model.steps[0].id,
    batch.id,
    resin.id,
    hardener.id,
    resin.containers[0].id,
    resin.containers[1].id,
    hardener.containers[0].id,
    mix.id,
  );
  codes.push(
    batch.drivers[0].serial,
    batch.code,
    resin.containers[1].code,
    hardener.containers[0].code,
    mix.code,
    station.code,
    `01${'0'.repeat(13)}`,
  );
});
afterAll(() => app.close());

// ---- generators -------------------------------------------------------------------------------

const nasty = fc.constantFrom(
  'a\u0000b',
  '\u0000',
  '',
  ' ',
  '   ',
  '\u202Eevil',
  'x'.repeat(5000),
  "'; DROP TABLE lots; --",
  '%00',
  '../../etc/passwd',
  '\uFFFF',
  '\uD800',
  '<script>alert(1)</script>',
  '0',
  '-1',
  'NaN',
  'null',
  'true',
  '2026-02-30',
  '9999-12-31',
  '0000-01-01',
  '2026-03-04T15:30:00.000Z',
  '2026-03-04T15:30:00+25:00',
  '1e-10',
  '１２３',
);
const numbers = fc.oneof(
  fc.constantFrom(1e-10, 0.0005, -1, 0, -0, 1e308, -1e308, 2 ** 31, 2 ** 53 + 1, 1e21, 999.999, 0.1 + 0.2),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer(),
);
const withNul = fc.tuple(fc.string({ maxLength: 8 }), fc.string({ maxLength: 8 })).map(([a, b]) => `${a}\u0000${b}`);
const text = fc.oneof(fc.string({ maxLength: 30 }), fc.string({ unit: 'binary', maxLength: 30 }), nasty, withNul);
const idLike = fc.oneof(
  fc.constantFrom(...(['00000000-0000-4000-8000-000000000000'] as string[])),
  fc.uuid(),
  fc.constant('placeholder-id'),
);
const leaf = fc.oneof(
  { weight: 3, arbitrary: text },
  { weight: 3, arbitrary: numbers },
  { weight: 1, arbitrary: fc.boolean() },
  { weight: 1, arbitrary: fc.constant(null) },
  { weight: 2, arbitrary: idLike },
  { weight: 3, arbitrary: fc.constant('__real_id__') },
  { weight: 2, arbitrary: fc.constant('__real_code__') },
  { weight: 1, arbitrary: fc.date({ noInvalidDate: true, min: new Date(0), max: new Date(4102444800000) }).map((d) => d.toISOString()) },
);
const fieldName = fc.oneof(
  { weight: 8, arbitrary: fc.constantFrom(...FIELD_NAMES) },
  { weight: 1, arbitrary: fc.string({ maxLength: 8 }) },
);
const { value } = fc.letrec<{ value: unknown }>((tie) => ({
  value: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    { weight: 6, arbitrary: leaf },
    { weight: 1, arbitrary: fc.array(tie('value'), { maxLength: 3 }) },
    { weight: 1, arbitrary: fc.dictionary(fieldName, tie('value'), { maxKeys: 4 }) },
  ),
}));
/**
 * Bodies for one route: mostly objects whose keys are the fields the route itself names when
 * asked with an empty body (its 400 lists them), so generated values reach its validation and
 * rules rather than stopping at "is required"; some with any schema's field names; some not
 * objects at all.
 */
/** Values that broke the app when probed: NUL characters, quantities finer or larger than a column, huge text. */
const poison = fc.oneof(
  withNul,
  fc.constantFrom('a\u0000b', '\u0000', '\uD800', 'x'.repeat(5000)),
  fc.constantFrom(1e-10, 0.0005, 1e-7, 1e308, 2 ** 53 + 1, 1e15, -1, 0),
  fc.constantFrom(['a\u0000'], [{ materialId: '__real_id__', amountPerUnit: 1e-10 }], { x: '\u0000' }),
);

function bodyFor(routeFields: string[]) {
  const own = routeFields.length ? fc.constantFrom(...routeFields) : fieldName;
  const base = fc.record(Object.fromEntries(routeFields.map((f) => [f, value])), { requiredKeys: [] });
  return fc.oneof(
    // One of the route's own fields poisoned, the others generated.
    { weight: 5, arbitrary: fc.tuple(base, own, poison).map(([b, f, p]) => ({ ...b, [f]: p })) },
    {
      weight: 5,
      arbitrary: fc
        .record(Object.fromEntries(routeFields.map((f) => [f, value])), { requiredKeys: [] })
        .chain((base) => fc.dictionary(own, value, { maxKeys: 3 }).map((extra) => ({ ...base, ...extra }))),
    },
    { weight: 3, arbitrary: fc.dictionary(fieldName, value, { maxKeys: 10 }) },
    { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 2 }) },
    { weight: 1, arbitrary: fc.constant(undefined) },
  );
}

/** The top-level body fields a route names when sent an empty object with real ids in its path. */
async function fieldsOf(route: Route): Promise<string[]> {
  const path = route.path.replace(/:(\w+)/g, '00000000-0000-4000-8000-000000000000');
  const res = await api(app.baseUrl, user.token).request(route.method, path, {});
  const details = (res.body as { error?: { details?: { field?: string }[] } } | null)?.error?.details ?? [];
  return [
    ...new Set(
      details
        .map((d) => (d.field ?? '').split('.')[0])
        .filter((f) => f && !['params', 'query', 'Content-Type', 'Idempotency-Key'].includes(f)),
    ),
  ];
}
/** How the body is sent: JSON, a broken JSON text, or a content type the API does not take. */
const encoding = fc.oneof(
  { weight: 8, arbitrary: fc.constant({ kind: 'json' as const }) },
  {
    weight: 1,
    arbitrary: fc
      .constantFrom('{"broken', '[1,', '\u0000', 'null', '"text"', '{"a":1}}')
      .map((raw) => ({ kind: 'raw' as const, raw, type: 'application/json' })),
  },
  {
    weight: 1,
    arbitrary: fc
      .constantFrom(
        'text/plain',
        'application/x-www-form-urlencoded',
        'application/xml',
        'multipart/form-data; boundary=x',
        'application/json; charset=utf-16',
      )
      .map((type) => ({ kind: 'raw' as const, raw: 'a=1&b=2', type })),
  },
);
const query = fc.dictionary(fieldName, fc.oneof(text, numbers.map(String), fc.constant('__real_id__')), { maxKeys: 4 });
const param = fc.oneof(
  { weight: 4, arbitrary: fc.constant('__real_id__') },
  { weight: 2, arbitrary: fc.constant('__real_code__') },
  { weight: 2, arbitrary: idLike },
  { weight: 2, arbitrary: text.filter((s) => s.length > 0) },
);

/** Puts real ids and codes where the generators left placeholders. */
function fill(v: unknown, next: () => number): unknown {
  if (v === '__real_id__') return ids[next() % ids.length];
  if (v === '__real_code__') return codes[next() % codes.length];
  if (Array.isArray(v)) return v.map((x) => fill(x, next));
  if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, fill(x, next)]));
  return v;
}

/** Percent-encodes, sending a lone surrogate as the invalid UTF-8 bytes ED A0 80 (what a broken client would). */
function enc(v: unknown): string {
  return Array.from(String(v))
    .map((ch) => {
      try {
        return encodeURIComponent(ch);
      } catch {
        return '%ED%A0%80';
      }
    })
    .join('');
}

function pathFor(route: Route, values: unknown[]): string {
  let i = 0;
  return route.path.replace(/:(\w+)/g, () => enc(values[i++] ?? 'x'));
}

function queryString(q: Record<string, unknown>): string {
  const entries = Object.entries(q);
  return entries.length ? `?${entries.map(([k, v]) => `${enc(k)}=${enc(v)}`).join('&')}` : '';
}

let counter = 0;
const seeded = () => (counter = (counter * 1103515245 + 12345) % 2 ** 31);

async function send(
  route: Route,
  input: {
    params: unknown[];
    query: Record<string, unknown>;
    body: unknown;
    encoding: { kind: 'json' } | { kind: 'raw'; raw: string; type: string };
  },
) {
  const path = pathFor(route, fill(input.params, seeded) as unknown[]) + queryString(fill(input.query, seeded) as Record<string, unknown>);
  const client = api(app.baseUrl, user.token);
  if (input.encoding.kind === 'raw')
    return {
      path,
      res: await client.request(route.method, path, undefined, {
        raw: input.encoding.raw,
        headers: { 'content-type': input.encoding.type },
      }),
    };
  return { path, res: await client.request(route.method, path, fill(input.body, seeded)) };
}

const runs = (n: number) => ({ numRuns: n, seed: process.env.FC_SEED ? Number(process.env.FC_SEED) : undefined, endOnFailure: true });

// ---- properties -----------------------------------------------------------------------------

describe('the route list comes from the router', () => {
  it('finds the contract routes and the upload routes', () => {
    const names = ROUTES.map((r) => `${r.method} ${r.path}`);
    for (const contract of [
      'POST /api/auth/login',
      'POST /api/lots',
      'POST /api/stations/:id/load',
      'POST /api/scans/resolve',
      'POST /api/batches/:id/steps/:stepId/start',
      'POST /api/readings',
    ]) {
      expect(names).toContain(contract);
    }
    expect(
      ROUTES.filter((r) => r.upload)
        .map((r) => r.path)
        .sort(),
    ).toEqual(['/api/lots/:id/certificate', '/api/materials/:id/sds']);
    expect(STATE_CHANGING.length).toBeGreaterThan(30);
    expect(FIELD_NAMES).toEqual(
      expect.arrayContaining(['materialId', 'quantityPerContainer', 'containerCode', 'resinQuantity', 'amountPerUnit']),
    );
  });
});

describe('every state-changing route: generated input is never a 5xx, and a refusal changes no row', () => {
  for (const route of STATE_CHANGING.filter((r) => !SKIPPED.has(`${r.method} ${r.path}`))) {
    it(`${route.method} ${route.path}`, async () => {
      const routeFields = await fieldsOf(route);
      let before = await checksum();
      await fc.assert(
        fc.asyncProperty(
          fc.array(param, { minLength: route.params.length, maxLength: route.params.length }),
          query,
          bodyFor(routeFields),
          encoding,
          async (params, q, b, enc) => {
            const { path, res } = await send(route, { params, query: q, body: b, encoding: enc });
            expect(res.status, `${route.method} ${path} → ${res.status} ${JSON.stringify(res.body)}`).toBeLessThan(500);
            const after = await checksum();
            if (res.status >= 400) expect(after, `${route.method} ${path} was refused (${res.status}) but changed rows`).toEqual(before);
            before = after;
          },
        ),
        runs(route.path === '/api/auth/login' ? 8 : 12),
      );
    });
  }
});

describe('read routes: generated queries and parameters are never a 5xx', () => {
  it('every GET route', async () => {
    const gets = ROUTES.filter((r) => r.method === 'GET');
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...gets), fc.array(param, { minLength: 3, maxLength: 3 }), query, async (route, params, q) => {
        const { path, res } = await send(route, { params, query: q, body: undefined, encoding: { kind: 'json' } });
        expect(res.status, `GET ${path} → ${res.status} ${JSON.stringify(res.body)}`).toBeLessThan(500);
      }),
      runs(gets.length * 3),
    );
  });
});

describe('scanned codes', () => {
  /** GS1 element strings with and without symbology identifiers and FNC1 (GS, 0x1D) separators, Digital Links, and noise. */
  const gs1ish = fc
    .tuple(
      fc.constantFrom('', ']C1', ']d2', ']Q3', ']e0'),
      fc.array(
        fc.tuple(
          fc.constantFrom('01', '10', '11', '17', '21', '00', '240', '3103', '7003', '99', '8200'),
          fc.stringMatching(/^[0-9A-Za-z-]{0,20}$/),
        ),
        { maxLength: 4 },
      ),
      fc.constantFrom('', '\u001d'),
    )
    .map(([sym, parts, sep]) => sym + parts.map(([ai, v]) => ai + v).join(sep));
  const code = fc.oneof(
    gs1ish,
    fc.webUrl().map((u) => `${u}/01/09506000134352/10/ABC`),
    fc.string({ maxLength: 60 }),
    fc.string({ unit: 'binary', maxLength: 60 }),
    fc.constant('__real_code__'),
    nasty,
  );

  it('POST /api/scans/resolve and a station load with generated codes: never a 5xx; a refused load changes nothing', async () => {
    let before = await checksum();
    const [stationId, batchId] = [ids[3], ids[6]];
    await fc.assert(
      fc.asyncProperty(code, fc.boolean(), async (c, asMix) => {
        const scanned = fill(c, seeded) as string;
        const resolve = await api(app.baseUrl, user.token).post('/api/scans/resolve', { code: scanned });
        expect(resolve.status, `resolve ${JSON.stringify(scanned)} → ${resolve.status} ${JSON.stringify(resolve.body)}`).toBeLessThan(500);
        const load = await api(app.baseUrl, user.token).post(`/api/stations/${stationId}/load`, {
          batchId,
          [asMix ? 'mixCode' : 'containerCode']: scanned,
        });
        expect(load.status, `load ${JSON.stringify(scanned)} → ${load.status}`).toBeLessThan(500);
        const after = await checksum();
        if (load.status >= 400) expect(after).toEqual(before);
        before = after;
      }),
      runs(40),
    );
  });
});

describe('uploads', () => {
  /** A multipart body built by hand: sometimes well-formed, often not. */
  const multipart = fc.record({
    boundary: fc.oneof(fc.constant('b0undary'), fc.stringMatching(/^[A-Za-z0-9'()+_,\-./:=?]{1,70}$/), fc.constant('')),
    declaredBoundary: fc.oneof(fc.constant('same'), fc.constant('none'), fc.constant('other')),
    field: fc.constantFrom('file', 'document', '', 'expiresOn'),
    filename: fc.oneof(
      fc.constantFrom('coa.pdf', 'poly.html', 'a\u0000b.pdf', '', '../../x.pdf', 'n\u202Efdp.exe', 'x'.repeat(400)),
      fc.string({ maxLength: 20 }),
    ),
    partType: fc.constantFrom('application/pdf', 'image/png', 'text/html', '', 'application/octet-stream'),
    content: fc.oneof(fc.constant(pdfBytes().toString('latin1')), fc.string({ unit: 'binary', maxLength: 200 }), fc.constant('')),
    extraField: fc.option(fc.tuple(fc.constantFrom('expiresOn', 'x', 'file'), text)),
    cut: fc.option(fc.nat(400)),
    brokenHeader: fc.boolean(),
  });

  it('POST to both upload routes with generated multipart: never a 5xx; a refusal stores nothing', async () => {
    const uploads = ROUTES.filter((r) => r.upload);
    let before = await checksum();
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...uploads), multipart, async (route, m) => {
        const id = route.path.includes('/lots/') ? ids[7] : ids[0];
        const crlf = '\r\n';
        let text = '';
        if (m.extraField)
          text += `--${m.boundary}${crlf}Content-Disposition: form-data; name="${m.extraField[0]}"${crlf}${crlf}${m.extraField[1]}${crlf}`;
        text += `--${m.boundary}${crlf}`;
        text += m.brokenHeader
          ? `Content-Disposition form-data; name=${m.field}${crlf}`
          : `Content-Disposition: form-data; name="${m.field}"; filename="${m.filename}"${crlf}`;
        if (m.partType) text += `Content-Type: ${m.partType}${crlf}`;
        text += `${crlf}${m.content}${crlf}--${m.boundary}--${crlf}`;
        if (m.cut !== null) text = text.slice(0, m.cut);
        const declared =
          m.declaredBoundary === 'none'
            ? 'multipart/form-data'
            : `multipart/form-data; boundary=${m.declaredBoundary === 'same' ? m.boundary || '""' : 'elsewhere'}`;
        const res = await fetch(`${app.baseUrl}${route.path.replace(':id', id)}`, {
          method: 'POST',
          headers: { authorization: `Bearer ${user.token}`, 'content-type': declared },
          body: new Blob([new Uint8Array(Buffer.from(text, 'latin1'))]),
        });
        const answer = await res.text();
        expect(res.status, `${route.path} → ${res.status} ${answer}`).toBeLessThan(500);
        const after = await checksum();
        if (res.status >= 400) expect(after).toEqual(before);
        before = after;
      }),
      runs(60),
    );
  });
});
