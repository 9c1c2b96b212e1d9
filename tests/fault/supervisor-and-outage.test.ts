/**
 * Fault tests on the real `npm start` (scripts/start.ts as a child, its own PostgreSQL cluster in
 * a throwaway data folder, loopback only):
 *  - kill -9 of the server while readings and batches are being sent: the supervisor starts a
 *    new server, the cluster keeps running, and every request that was answered 2xx is in the
 *    database afterwards;
 *  - SIGTERM (what Ctrl-C does) stops the server and the cluster for good;
 *  - PostgreSQL stopped and started under load: meanwhile every answer is 503 DB_UNAVAILABLE with
 *    Retry-After (never a 500, never a dropped connection), the server process never exits, and
 *    it answers 2xx again by itself once the database is back; writes repeated with their
 *    Idempotency-Key through the outage are applied exactly once.
 * Every wait has a deadline, so a broken build fails instead of hanging.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { root } from '../../scripts/lib/proc';
import { pgCtl, postmasterPid, processAlive, startSupervised, type SupervisedApp } from '../helpers/supervised';

const dataDir = path.join(root, '.tmp', `fault-${crypto.randomBytes(4).toString('hex')}`);
let app: SupervisedApp | null = null;

interface Outcome {
  kind: 'reading' | 'batch';
  status: number;
  id?: string;
  code?: string;
  retryAfter?: string | null;
  /** The request got no answer at all (connection refused or reset). */
  lost?: string;
  at: number;
}

/** Sends readings and batches from `workers` loops until stopped; records every outcome. */
function startLoad(baseUrl: string, token: string, modelId: string, area: string, workers = 4) {
  const outcomes: Outcome[] = [];
  let running = true;
  let n = 0;
  const headers = { 'content-type': 'application/json', authorization: `Bearer ${token}` };
  const one = async (): Promise<void> => {
    const i = n++;
    const kind: Outcome['kind'] = i % 5 === 4 ? 'batch' : 'reading';
    const body =
      kind === 'batch'
        ? { modelId, quantity: 2 }
        : { area, at: new Date(Date.UTC(2026, 0, 1) + i * 1000).toISOString(), tempC: 20 + (i % 50) / 10 };
    try {
      const res = await fetch(`${baseUrl}${kind === 'batch' ? '/api/batches' : '/api/readings'}`, {
        method: 'POST',
        headers,
        body: JSON.stringify(body),
      });
      const text = await res.text();
      let parsed: { id?: string; batch?: { id: string }; error?: { code: string } } = {};
      try {
        parsed = JSON.parse(text) as typeof parsed;
      } catch {
        // not JSON: recorded by status
      }
      outcomes.push({
        kind,
        status: res.status,
        id: kind === 'batch' ? parsed.batch?.id : parsed.id,
        code: parsed.error?.code,
        retryAfter: res.headers.get('retry-after'),
        at: Date.now(),
      });
    } catch (err) {
      outcomes.push({ kind, status: 0, lost: String((err as Error).cause ?? err), at: Date.now() });
      await new Promise((r) => setTimeout(r, 50)); // nothing listening: do not spin
    }
  };
  const loops = Array.from({ length: workers }, async () => {
    while (running) await one();
  });
  return {
    outcomes,
    ok: () => outcomes.filter((o) => o.status >= 200 && o.status < 300).length,
    count: (pred: (o: Outcome) => boolean) => outcomes.filter(pred).length,
    async stop() {
      running = false;
      await Promise.all(loops);
    },
  };
}

/**
 * One writer that sends readings with an Idempotency-Key, as a station does, and repeats each
 * with the same key after 503 DB_UNAVAILABLE or 409 IDEMPOTENCY_IN_PROGRESS until it is answered.
 */
function startKeyedWriter(baseUrl: string, token: string, area: string) {
  const done: { key: string; id: string }[] = [];
  const problems: string[] = [];
  let running = true;
  const loop = (async () => {
    for (let i = 0; running; i++) {
      const key = crypto.randomUUID();
      const body = JSON.stringify({ area, at: new Date(Date.UTC(2026, 1, 1) + i * 1000).toISOString(), tempC: 21 });
      const deadline = Date.now() + 120_000;
      for (;;) {
        const res = await fetch(`${baseUrl}/api/readings`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', authorization: `Bearer ${token}`, 'idempotency-key': key },
          body,
        });
        const parsed = (await res.json()) as { id?: string; error?: { code: string } };
        if (res.status === 201 && parsed.id) {
          done.push({ key, id: parsed.id });
          break;
        }
        const code = parsed.error?.code;
        if ((res.status === 503 && code === 'DB_UNAVAILABLE') || (res.status === 409 && code === 'IDEMPOTENCY_IN_PROGRESS')) {
          if (Date.now() > deadline) {
            problems.push(`key ${key} still ${res.status} ${code} after 120 s`);
            break;
          }
          await new Promise((r) => setTimeout(r, 1000));
          continue;
        }
        problems.push(`${res.status} ${code ?? ''}`);
        break;
      }
    }
  })();
  return {
    done,
    problems,
    async stop() {
      running = false;
      await loop;
    },
  };
}

/** Resolves when `cond()` holds; fails the test with `what` after `timeoutMs`. */
async function until(cond: () => boolean, what: string, timeoutMs = 120_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!cond()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function signIn(baseUrl: string, email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo' }),
  });
  expect(res.status).toBe(200);
  return ((await res.json()) as { token: string }).token;
}

async function firstModelId(baseUrl: string, token: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/models`, { headers: { authorization: `Bearer ${token}` } });
  const body = (await res.json()) as { items: { id: string }[] };
  expect(body.items.length).toBeGreaterThan(0);
  return body.items[0].id;
}

/** Ids of `ids` that are not in `table` (readings or build_batches) of the app's database. */
async function missingIds(databaseUrl: string, table: 'readings' | 'build_batches', ids: string[]): Promise<string[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const found = await client.query<{ id: string }>(`SELECT id FROM ${table} WHERE id = ANY($1::uuid[])`, [ids]);
    const present = new Set(found.rows.map((r) => r.id));
    return ids.filter((id) => !present.has(id));
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  fs.mkdirSync(path.dirname(dataDir), { recursive: true });
  app = await startSupervised(dataDir);
});

afterAll(async () => {
  await app?.stop();
  if (processAlive(postmasterPid(dataDir))) {
    try {
      pgCtl(dataDir, 'stop');
    } catch (err) {
      console.error(err);
    }
  }
  fs.rmSync(dataDir, { recursive: true, force: true });
  fs.rmSync(`${dataDir}.owner`, { force: true });
});

describe('npm start supervises the server', () => {
  it('after kill -9 under load, starts it again while PostgreSQL keeps running; every 2xx is in the database', async () => {
    const a = app!;
    const token = await signIn(a.baseUrl, 'quality@tacklog.test'); // quality may record readings and open batches
    const modelId = await firstModelId(a.baseUrl, token);
    const postmaster = postmasterPid(dataDir);
    expect(processAlive(postmaster)).toBe(true);
    const firstServer = a.serverPid();

    const load = startLoad(a.baseUrl, token, modelId, `fault-kill-${crypto.randomBytes(3).toString('hex')}`);
    await until(() => load.ok() >= 40, '40 answered writes before the kill');
    const mark = a.lines.length;
    process.kill(firstServer, 'SIGKILL');
    await a.waitForLog(/server is answering again/, mark);
    const okAtRestart = load.ok();
    await until(() => load.ok() >= okAtRestart + 40, '40 answered writes after the restart');
    await load.stop();

    expect(a.serverPid()).not.toBe(firstServer);
    expect(processAlive(firstServer)).toBe(false);
    expect(a.lines.slice(mark).some((l) => /server stopped unexpectedly \(killed by SIGKILL\)/.test(l))).toBe(true);
    // The cluster was not touched: same postmaster, still running.
    expect(postmasterPid(dataDir)).toBe(postmaster);
    expect(processAlive(postmaster)).toBe(true);
    // Some requests got no answer while nothing listened; every answer was 2xx.
    const answered = load.outcomes.filter((o) => o.status !== 0);
    expect(answered.filter((o) => o.status < 200 || o.status >= 300)).toEqual([]);
    expect(load.count((o) => o.status === 0)).toBeGreaterThan(0);

    const readings = answered.filter((o) => o.kind === 'reading').map((o) => o.id!);
    const batches = answered.filter((o) => o.kind === 'batch').map((o) => o.id!);
    expect(readings.length).toBeGreaterThan(0);
    expect(batches.length).toBeGreaterThan(0);
    expect(await missingIds(a.databaseUrl, 'readings', readings)).toEqual([]);
    expect(await missingIds(a.databaseUrl, 'build_batches', batches)).toEqual([]);
  });

  it('SIGTERM (as Ctrl-C) stops the server and the cluster', async () => {
    const a = app!;
    const server = a.serverPid();
    const postmaster = postmasterPid(dataDir);
    const code = await a.stop();
    expect(code).toBe(143); // 128 + SIGTERM
    expect(processAlive(server)).toBe(false);
    await until(() => !processAlive(postmaster), 'the postmaster to stop', 30_000);
    expect(a.lines.some((l) => /PostgreSQL stopped/.test(l))).toBe(true);
    app = null;
  });
});

describe('PostgreSQL stopped and started under load', () => {
  it('answers 503 DB_UNAVAILABLE with Retry-After meanwhile, never crashes, and recovers by itself', async () => {
    app = await startSupervised(dataDir); // the same data folder: the kept cluster starts again, no seeding
    const a = app;
    const token = await signIn(a.baseUrl, 'quality@tacklog.test');
    const modelId = await firstModelId(a.baseUrl, token);
    const server = a.serverPid();

    const load = startLoad(a.baseUrl, token, modelId, `fault-db-${crypto.randomBytes(3).toString('hex')}`, 3);
    const keyedArea = `fault-keyed-${crypto.randomBytes(3).toString('hex')}`;
    const keyed = startKeyedWriter(a.baseUrl, token, keyedArea);
    await until(() => load.ok() >= 30, '30 answered writes before stopping PostgreSQL');
    pgCtl(dataDir, 'stop');
    const stoppedAt = Date.now();
    await until(() => load.count((o) => o.status === 503 && o.at > stoppedAt) >= 30, '30 answers of 503 while PostgreSQL is stopped');
    // And a read with a session, and the health check, while it is down.
    const health = await fetch(`${a.baseUrl}/api/health`, { headers: { authorization: `Bearer ${token}` } });
    expect(health.status).toBe(503);
    expect(health.headers.get('retry-after')).toMatch(/^\d+$/);
    pgCtl(dataDir, 'start');
    const startedAt = Date.now();
    await until(
      () => load.count((o) => o.status >= 200 && o.status < 300 && o.at > startedAt) >= 30,
      '30 answered writes after PostgreSQL is back',
    );
    await load.stop();
    await keyed.stop();

    // Never an answer other than 2xx or 503 DB_UNAVAILABLE + Retry-After, never a dropped connection.
    const unexpected = load.outcomes.filter(
      (o) =>
        !((o.status >= 200 && o.status < 300) || (o.status === 503 && o.code === 'DB_UNAVAILABLE' && /^\d+$/.test(o.retryAfter ?? ''))),
    );
    expect(unexpected).toEqual([]);
    // The same server process throughout: no crash, no restart.
    expect(a.serverPid()).toBe(server);
    expect(processAlive(server)).toBe(true);
    expect(a.lines.some((l) => /server stopped unexpectedly/.test(l))).toBe(false);
    expect(a.lines.some((l) => /the database is reachable again/.test(l))).toBe(true);
    expect((await fetch(`${a.baseUrl}/api/health`)).status).toBe(200);

    const ok = load.outcomes.filter((o) => o.status >= 200 && o.status < 300);
    expect(
      await missingIds(
        a.databaseUrl,
        'readings',
        ok.filter((o) => o.kind === 'reading').map((o) => o.id!),
      ),
    ).toEqual([]);
    expect(
      await missingIds(
        a.databaseUrl,
        'build_batches',
        ok.filter((o) => o.kind === 'batch').map((o) => o.id!),
      ),
    ).toEqual([]);

    // Keyed writes repeated through the outage: each applied exactly once.
    expect(keyed.problems).toEqual([]);
    expect(keyed.done.length).toBeGreaterThan(0);
    const client = new pg.Client({ connectionString: a.databaseUrl });
    await client.connect();
    try {
      const rows = await client.query<{ id: string }>('SELECT id FROM readings WHERE area = $1', [keyedArea]);
      expect(rows.rows.map((r) => r.id).sort()).toEqual(keyed.done.map((d) => d.id).sort());
    } finally {
      await client.end();
    }
  });
});
