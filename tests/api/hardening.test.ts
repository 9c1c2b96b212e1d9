/**
 * What probing the app as an attacker and a bad network found, kept closed: cross-site and form
 * posts, sessions that outlive logout and password change, NUL characters, quantities finer than
 * the database keeps, malformed multipart, X-Forwarded-For against the sign-in limit, download
 * names, and Idempotency-Keys reused with another body.
 */
import net from 'node:net';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { db } from '../../server/db/client';
import { attachments, containers, sessions, suppliers, users } from '../../server/db/schema';
import { trustProxyFromEnv } from '../../server/config';
import { createSession } from '../../server/services/auth';
import { decimalPlaces } from '../../shared/schemas/common';
import { errorBodySchema } from '../../shared/schemas/common';
import { api, listen, startApp, type TestApp } from '../helpers/api';
import { ensureUser, TEST_PASSWORD, type TestUser } from '../helpers/db';
import { createLot, createMaterial, createStation, sfx } from '../helpers/fixtures';
import { fields, newMaterial, newSupplier, pdfBytes, upload } from '../helpers/receiving';

let app: TestApp;
let admin: TestUser;
let clerk: TestUser;
let assembler: TestUser;
let quality: TestUser;
beforeAll(async () => {
  app = await startApp();
  [admin, clerk, assembler, quality] = await Promise.all([
    ensureUser(['admin']),
    ensureUser(['receiving']),
    ensureUser(['assembler']),
    ensureUser(['quality']),
  ]);
});
afterAll(() => app.close());
const as = (u?: TestUser) => api(app.baseUrl, u?.token);
const cookieOf = (token: string) => `tacklog_session=${token}`;

async function containerStatus(id: string) {
  return (await db.select({ status: containers.status }).from(containers).where(eq(containers.id, id)))[0].status;
}

describe('cross-site requests and form posts (CSRF)', () => {
  async function openContainer() {
    const m = await createMaterial();
    const lot = await createLot({ materialId: m.id, containers: 1, containerStatus: 'open', openedAt: new Date() });
    return lot.containers[0];
  }

  it('refuses a cookie-signed change from a page on another port of the same host (Origin, Sec-Fetch-Site) and changes nothing', async () => {
    const c = await openContainer();
    const cookie = cookieOf(assembler.token);
    // What a page on http://127.0.0.1:<other port> auto-submitting a form sends.
    const form = await api(app.baseUrl).post(`/api/containers/${c.id}/empty`, undefined, {
      raw: 'x=1',
      headers: { cookie, 'content-type': 'application/x-www-form-urlencoded', origin: 'http://127.0.0.1:1', 'sec-fetch-site': 'same-site' },
    });
    expect(form.status).toBe(403);
    expect(form.body.error.code).toBe('CROSS_SITE_REQUEST');
    const fetched = await api(app.baseUrl).post(`/api/containers/${c.id}/empty`, {}, { headers: { cookie, origin: 'http://127.0.0.1:1' } });
    expect(fetched.status).toBe(403);
    const sameSite = await api(app.baseUrl).post(
      `/api/containers/${c.id}/empty`,
      {},
      { headers: { cookie, 'sec-fetch-site': 'same-site' } },
    );
    expect(sameSite.status).toBe(403);
    expect(await containerStatus(c.id)).toBe('open');
  });

  it('refuses a body that is not JSON with 415 (text/plain, urlencoded), even without Origin headers', async () => {
    const c = await openContainer();
    for (const type of ['text/plain', 'application/x-www-form-urlencoded']) {
      const res = await api(app.baseUrl).post(`/api/containers/${c.id}/empty`, undefined, {
        raw: 'a=b',
        headers: { cookie: cookieOf(assembler.token), 'content-type': type },
      });
      // RFC 9110 §15.5.16: 415 Unsupported Media Type.
      expect(res.status, type).toBe(415);
      expect(errorBodySchema.parse(res.body).error.code).toBe('UNSUPPORTED_MEDIA_TYPE');
    }
    const bearer = await as(assembler).post(`/api/containers/${c.id}/empty`, undefined, {
      raw: 'a=b',
      headers: { 'content-type': 'text/plain' },
    });
    expect(bearer.status).toBe(415);
    // Multipart goes only to upload routes.
    const form = new FormData();
    form.append('x', '1');
    const multipart = await fetch(`${app.baseUrl}/api/containers/${c.id}/empty`, {
      method: 'POST',
      body: form,
      headers: { authorization: `Bearer ${assembler.token}` },
    });
    expect(multipart.status).toBe(415);
    expect(await containerStatus(c.id)).toBe('open');
  });

  it("accepts the app's own page (same-origin), a body-less POST without Content-Type, and scripts with a bearer token from anywhere", async () => {
    const c = await openContainer();
    const own = await api(app.baseUrl).post(
      `/api/containers/${c.id}/location`,
      { location: 'Shelf B2' },
      {
        headers: { cookie: cookieOf(assembler.token), origin: app.baseUrl, 'sec-fetch-site': 'same-origin' },
      },
    );
    expect(own.status).toBe(200);
    const bodiless = await api(app.baseUrl).post(`/api/containers/${c.id}/empty`, undefined, {
      headers: { cookie: cookieOf(assembler.token), 'sec-fetch-site': 'same-origin' },
    });
    expect(bodiless.status).toBe(200);
    expect(await containerStatus(c.id)).toBe('empty');
    const c2 = await openContainer();
    const script = await as(assembler).post(`/api/containers/${c2.id}/empty`, undefined, { headers: { origin: 'http://elsewhere.test' } });
    expect(script.status).toBe(200);
  });
});

describe("the Vite dev server's proxy", () => {
  it("passes: it forwards the page's Host (127.0.0.1:5173) with its Origin, so the two still match", async () => {
    const http = await import('node:http');
    const m = await createMaterial();
    const lot = await createLot({ materialId: m.id, containers: 1, containerStatus: 'open', openedAt: new Date() });
    const { port } = new URL(app.baseUrl);
    const status = await new Promise<number>((resolve, reject) => {
      const req = http.request(
        {
          host: '127.0.0.1',
          port: Number(port),
          method: 'POST',
          path: `/api/containers/${lot.containers[0].id}/location`,
          // What vite's proxy (changeOrigin off, as in vite.config.ts) sends on for the browser.
          headers: {
            host: '127.0.0.1:5173',
            origin: 'http://127.0.0.1:5173',
            'sec-fetch-site': 'same-origin',
            cookie: cookieOf(clerk.token),
            'content-type': 'application/json',
          },
        },
        (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        },
      );
      req.on('error', reject);
      req.end(JSON.stringify({ location: 'Rack 4' }));
    });
    expect(status).toBe(200);
  });
});

describe('sessions end', () => {
  it('logout ends the token at once, for the bearer header and the cookie alike', async () => {
    const user = await ensureUser(['quality'], { email: `logout-${sfx()}@tacklog.test` });
    expect((await as(user).get('/api/auth/me')).status).toBe(200);
    const out = await as(user).post('/api/auth/logout');
    expect(out.status).toBe(200);
    expect((await as(user).get('/api/auth/me')).status).toBe(401);
    expect((await api(app.baseUrl).get('/api/auth/me', { headers: { cookie: cookieOf(user.token) } })).status).toBe(401);
    // Logging out again (or without a session) is harmless.
    expect((await as(user).post('/api/auth/logout')).status).toBe(200);
    const [row] = await db.select().from(sessions).where(eq(sessions.userId, user.id));
    expect(row.revokedAt).not.toBeNull();
  });

  it('a password change keeps this session, ends the others, and the new password signs in', async () => {
    const user = await ensureUser(['receiving'], { email: `pw-${sfx()}@tacklog.test` });
    const other = (await createSession(user.id)).token;
    const wrong = await as(user).post('/api/auth/password', { currentPassword: 'not-it', newPassword: 'a-new-password-1' });
    expect(wrong.status).toBe(400);
    expect(fields(wrong.body)).toEqual(['currentPassword']);
    const short = await as(user).post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'short' });
    expect(fields(short.body)).toEqual(['newPassword']);
    expect((await api(app.baseUrl, other).get('/api/auth/me')).status).toBe(200);

    const ok = await as(user).post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'a-new-password-1' });
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ ok: true, endedSessions: 1 });
    expect((await as(user).get('/api/auth/me')).status).toBe(200);
    expect((await api(app.baseUrl, other).get('/api/auth/me')).status).toBe(401);
    expect((await api(app.baseUrl).post('/api/auth/login', { email: user.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await api(app.baseUrl).post('/api/auth/login', { email: user.email, password: 'a-new-password-1' })).status).toBe(200);
    expect((await api(app.baseUrl).post('/api/auth/password', { currentPassword: 'x', newPassword: 'y-y-y-y-y-y' })).status).toBe(401);
  });

  it('deactivating a user ends every session of theirs at once', async () => {
    const user = await ensureUser(['assembler'], { email: `off-${sfx()}@tacklog.test` });
    expect((await as(user).get('/api/auth/me')).status).toBe(200);
    await db.update(users).set({ active: false }).where(eq(users.id, user.id));
    expect((await as(user).get('/api/auth/me')).status).toBe(401);
  });

  it('a token signed with the key but without a session row is not accepted', async () => {
    const jwt = (await import('jsonwebtoken')).default;
    const { config } = await import('../../server/config');
    const forged = jwt.sign({}, config.jwtSecret, { subject: admin.id, expiresIn: '1h', algorithm: 'HS256' });
    expect((await api(app.baseUrl, forged).get('/api/auth/me')).status).toBe(401);
    const unknownSession = jwt.sign({}, config.jwtSecret, {
      subject: admin.id,
      jwtid: '00000000-0000-4000-8000-000000000000',
      expiresIn: '1h',
      algorithm: 'HS256',
    });
    expect((await api(app.baseUrl, unknownSession).get('/api/auth/me')).status).toBe(401);
  });
});

describe('NUL characters', () => {
  it('are 400 naming the field in bodies, queries and params, and nothing is stored', async () => {
    const before = (await db.select({ n: sql<number>`count(*)::int` }).from(suppliers))[0].n;
    const body = await as(admin).post('/api/suppliers', { name: 'a\u0000b' });
    expect(body.status).toBe(400);
    expect(fields(body.body)).toEqual(['name']);
    const nested = await as(admin).post('/api/models', {
      code: `M${sfx()}`,
      name: 'Woofer',
      steps: [{ name: 'x\u0000', stationKind: 'glue' }],
    });
    expect(nested.status).toBe(400);
    expect(fields(nested.body)).toEqual(['steps.0.name']);
    const query = await as(admin).get('/api/lots?q=%00');
    expect(query.status).toBe(400);
    expect(fields(query.body)).toEqual(['query.q']);
    const params = await as(admin).get('/api/drivers/A%00B');
    expect(params.status).toBe(400);
    expect(fields(params.body)).toEqual(['params.serial']);
    const defect = await as(quality).post('/api/defect-codes', { code: `D${sfx()}\u0000`, description: 'Rub and buzz' });
    expect(defect.status).toBe(400);
    expect((await db.select({ n: sql<number>`count(*)::int` }).from(suppliers))[0].n).toBe(before);
  });
});

describe('quantities finer or larger than the database keeps', () => {
  it('counts decimal places as written (the helper behind every quantity schema)', () => {
    expect(decimalPlaces(0.125)).toBe(3);
    expect(decimalPlaces(1e-10)).toBe(10);
    expect(decimalPlaces(2500)).toBe(0);
    expect(decimalPlaces(2.5e3)).toBe(0);
    expect(decimalPlaces(1.5e-3)).toBe(4);
    expect(decimalPlaces(-0.07)).toBe(2);
  });

  it('refuses 1e-10 and too many digits on every stored quantity with 400 naming the field', async () => {
    const sup = await newSupplier(as(admin));
    const mat = await newMaterial(as(admin));
    const lot = await as(clerk).post('/api/lots', {
      materialId: mat.id,
      supplierId: sup.id,
      supplierLot: `SL-${sfx()}`,
      containers: 1,
      quantityPerContainer: 1e-10,
    });
    expect(lot.status).toBe(400);
    expect(fields(lot.body)).toEqual(['quantityPerContainer']);
    expect(
      (
        await as(clerk).post('/api/lots', {
          materialId: mat.id,
          supplierId: sup.id,
          supplierLot: `SL-${sfx()}`,
          containers: 1,
          quantityPerContainer: 0.0005,
        })
      ).status,
    ).toBe(400);

    const order = await as(admin).patch(`/api/materials/${mat.id}`, { orderQuantity: 1e-10 });
    expect(fields(order.body)).toEqual(['orderQuantity']);
    const reorder = await as(admin).patch(`/api/materials/${mat.id}`, { reorderPoint: 0.0001 });
    expect(fields(reorder.body)).toEqual(['reorderPoint']);
    const ratio = await as(admin).patch(`/api/materials/${mat.id}`, { mixRatio: 1e-10 });
    expect(fields(ratio.body)).toEqual(['mixRatio']);

    const model = await as(admin).post('/api/models', {
      code: `M${sfx()}`,
      name: 'Tweeter',
      steps: [{ name: 'Glue', stationKind: 'glue', materials: [{ materialId: mat.id, amountPerUnit: 1e-10 }] }],
    });
    expect(model.status).toBe(400);
    expect(fields(model.body)).toEqual(['steps.0.materials.0.amountPerUnit']);

    const st = await createStation();
    const mix = await as(assembler).post(`/api/stations/${st.id}/mixes`, {
      resinCode: 'A',
      hardenerCode: 'B',
      resinQuantity: 1e-10,
      hardenerQuantity: 10,
    });
    expect(fields(mix.body)).toEqual(['resinQuantity']);

    const reading = await as(quality).post('/api/readings', { area: st.area, at: new Date().toISOString(), tempC: 21.125 });
    expect(fields(reading.body)).toEqual(['tempC']);
    // Two decimals are what numeric(5,2) keeps: accepted.
    expect(
      (await as(quality).post('/api/readings', { area: st.area, at: new Date().toISOString(), tempC: 21.25, rhPct: 45.5 })).status,
    ).toBe(201);
  });
});

describe('malformed multipart', () => {
  async function raw(path: string, contentType: string, body: Blob) {
    const res = await fetch(`${app.baseUrl}${path}`, {
      method: 'POST',
      headers: { authorization: `Bearer ${admin.token}`, 'content-type': contentType },
      body,
    });
    return { status: res.status, body: (await res.json()) as { error: { code: string } } };
  }

  it('is 400 (no boundary, cut short, broken part header, NUL in the file name) and stores nothing', async () => {
    const mat = await newMaterial(as(admin));
    const path = `/api/materials/${mat.id}/sds`;
    const count = async () => (await db.select({ n: sql<number>`count(*)::int` }).from(attachments))[0].n;
    const before = await count();
    const b = 'XyZboundary';
    const pdf = pdfBytes().toString('latin1');
    const cases: [string, string, string][] = [
      [
        'no boundary',
        'multipart/form-data',
        `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\n\r\n${pdf}\r\n--${b}--\r\n`,
      ],
      [
        'cut short',
        `multipart/form-data; boundary=${b}`,
        `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\nContent-Type: application/pdf\r\n\r\n${pdf.slice(0, 20)}`,
      ],
      [
        'broken part header',
        `multipart/form-data; boundary=${b}`,
        `--${b}\r\nContent-Disposition form-data name=file\r\n\u0001\u0002: \r\n\r\n${pdf}\r\n--${b}--\r\n`,
      ],
      [
        'NUL in the file name',
        `multipart/form-data; boundary=${b}`,
        `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a\u0000b.pdf"\r\nContent-Type: application/pdf\r\n\r\n${pdf}\r\n--${b}--\r\n`,
      ],
    ];
    for (const [what, type, body] of cases) {
      const res = await raw(path, type, new Blob([new Uint8Array(Buffer.from(body, 'latin1'))]));
      expect(res.status, what).toBe(400);
    }
    expect(await count()).toBe(before);
  });
});

describe('download names', () => {
  it('get the extension of the checked type and lose control and bidi characters', async () => {
    const mat = await newMaterial(as(admin));
    const up = await upload(app.baseUrl, `/api/materials/${mat.id}/sds`, {
      bytes: pdfBytes(),
      type: 'application/pdf',
      filename: 'poly.html',
      token: admin.token,
    });
    expect(up.status).toBe(201);
    const id = up.body.attachment.id as string;
    const meta = await as(admin).get(`/api/attachments/${id}/meta`);
    expect(meta.body.filename).toBe('poly.pdf');
    const got = await fetch(`${app.baseUrl}/api/attachments/${id}`, { headers: { authorization: `Bearer ${admin.token}` } });
    expect(got.headers.get('content-disposition')).toBe(`attachment; filename="poly.pdf"; filename*=UTF-8''poly.pdf`);

    // U+202E RIGHT-TO-LEFT OVERRIDE makes "sds\u202Efdp.exe" display as "sdsexe.pdf" (Unicode UAX #9).
    const mat2 = await newMaterial(as(admin));
    const tricky = await upload(app.baseUrl, `/api/materials/${mat2.id}/sds`, {
      bytes: pdfBytes(),
      type: 'application/pdf',
      filename: 'sds\u202Efdp.exe',
      token: admin.token,
    });
    expect(tricky.status, JSON.stringify(tricky.body)).toBe(201);
    const id2 = tricky.body.attachment.id as string;
    const meta2 = await as(admin).get(`/api/attachments/${id2}/meta`);
    expect(meta2.body.filename).toBe('sdsfdp.pdf');
  });

  it('clean a name stored before names were cleaned, on the way out', async () => {
    const mat = await newMaterial(as(admin));
    const up = await upload(app.baseUrl, `/api/materials/${mat.id}/sds`, {
      bytes: pdfBytes(),
      type: 'application/pdf',
      filename: 'x.pdf',
      token: admin.token,
    });
    const id = up.body.attachment.id as string;
    await db.update(attachments).set({ filename: 'old\u202Elmth.pdf.html\u0001' }).where(eq(attachments.id, id));
    const got = await fetch(`${app.baseUrl}/api/attachments/${id}`, { headers: { authorization: `Bearer ${admin.token}` } });
    expect(got.headers.get('content-disposition')).toBe(`attachment; filename="oldlmth.pdf.pdf"; filename*=UTF-8''oldlmth.pdf.pdf`);
  });
});

describe('Idempotency-Key reused with another body', () => {
  it('is 422 IDEMPOTENCY_KEY_REUSED; the same body (keys in any order) replays', async () => {
    const key = `k-${sfx()}`;
    const headers = { 'idempotency-key': key };
    const first = await as(admin).post('/api/suppliers', { name: `Idem supply ${key}`, notes: 'first' }, { headers });
    expect(first.status).toBe(201);
    const again = await as(admin).post('/api/suppliers', { notes: 'first', name: `Idem supply ${key}` }, { headers });
    expect(again.status).toBe(201);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(again.body.id).toBe(first.body.id);
    const other = await as(admin).post('/api/suppliers', { name: `Another supply ${key}` }, { headers });
    // RFC 4918 §11.2 / IETF draft-ietf-httpapi-idempotency-key-header §2.7: 422 for a key reused with another payload.
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('IDEMPOTENCY_KEY_REUSED');
    const named = await db
      .select()
      .from(suppliers)
      .where(eq(suppliers.name, `Another supply ${key}`));
    expect(named).toHaveLength(0);
  });
});

describe('sign-in limit and X-Forwarded-For (TACKLOG_TRUST_PROXY)', () => {
  it('reads the setting: off by default, a hop count, or named proxies; refuses "trust everyone"', () => {
    expect(trustProxyFromEnv(undefined)).toBe(false);
    expect(trustProxyFromEnv('')).toBe(false);
    expect(trustProxyFromEnv('off')).toBe(false);
    expect(trustProxyFromEnv('1')).toBe(1);
    expect(trustProxyFromEnv('loopback')).toBe('loopback');
    expect(trustProxyFromEnv('10.0.0.5, 127.0.0.1')).toBe('10.0.0.5, 127.0.0.1');
    expect(() => trustProxyFromEnv('true')).toThrow(/TACKLOG_TRUST_PROXY/);
  });

  async function attemptsUntilRefused(trustProxy: string | undefined): Promise<number[]> {
    const saved = { limit: process.env.TACKLOG_LOGIN_RATE_LIMIT, proxy: process.env.TACKLOG_TRUST_PROXY };
    process.env.TACKLOG_LOGIN_RATE_LIMIT = '3';
    if (trustProxy === undefined) delete process.env.TACKLOG_TRUST_PROXY;
    else process.env.TACKLOG_TRUST_PROXY = trustProxy;
    vi.resetModules();
    const fresh = await import('../../server/app');
    const freshDb = await import('../../server/db/client');
    const limited = await listen(fresh.createApp());
    try {
      const statuses: number[] = [];
      for (let i = 1; i <= 6; i++) {
        const res = await api(limited.baseUrl).post(
          '/api/auth/login',
          { email: 'nobody-here@tacklog.test', password: 'guess' },
          {
            headers: { 'x-forwarded-for': `203.0.113.${i}` },
          },
        );
        statuses.push(res.status);
      }
      return statuses;
    } finally {
      await limited.close();
      await freshDb.closeDb();
      for (const [name, value] of [
        ['TACKLOG_LOGIN_RATE_LIMIT', saved.limit],
        ['TACKLOG_TRUST_PROXY', saved.proxy],
      ] as const) {
        if (value === undefined) delete process.env[name];
        else process.env[name] = value;
      }
    }
  }

  it('by default a varied X-Forwarded-For does not reset the count: the 4th attempt is 429', async () => {
    expect(net.isIP('203.0.113.1')).toBe(4);
    // RFC 6585 §4: 429 Too Many Requests.
    expect(await attemptsUntilRefused(undefined)).toEqual([401, 401, 401, 429, 429, 429]);
  });

  it('with TACKLOG_TRUST_PROXY=loopback the header names the client (each address counted on its own)', async () => {
    expect(await attemptsUntilRefused('loopback')).toEqual([401, 401, 401, 401, 401, 401]);
  });
});
