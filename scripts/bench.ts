/**
 * `npm run bench`: the genealogy-trace benchmark.
 *
 * Seeds a large invented history into a throwaway database (a throwaway cluster, or a database
 * of its own on DATABASE_URL's server, dropped afterwards), starts the real app (server/index.ts)
 * on a free port, then measures backward traces (GET /api/drivers/:serial/trace) for random
 * drivers and forward traces (GET /api/lots/:id/trace) for lots used in ~5,000 drivers, through
 * the API and as the same SQL statements run bare, and prints p50/p95 with the targets:
 * API p95 < 50 ms per driver, < 500 ms per 5,000-driver lot, and within 3× bare SQL.
 * Exit code 0 when every target is met, 1 when one is missed.
 *
 * Knobs: TACKLOG_BENCH_DAYS (1095), TACKLOG_BENCH_PER_DAY (2000), TACKLOG_BENCH_DRIVER_SAMPLES
 * (200), TACKLOG_BENCH_LOT_SAMPLES (50), TACKLOG_BENCH_SEED (sampling). For working on the
 * queries: TACKLOG_BENCH_KEEP=1 keeps the seeded database (its name is printed) and
 * TACKLOG_BENCH_DATABASE=<that name> measures it again without seeding (neither is dropped).
 */
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import pg from 'pg';
import type { SQL } from 'drizzle-orm';
import { dropDatabase, ensureDatabase, freePort, providePostgres } from './pg';
import { CHILD_STDIO, log, onShutdown, root, runMain, stopChild } from './lib/proc';
import { BENCH_MATERIALS, benchSerial, benchSupplierLot, seedHistory } from './bench/seed-history';
import { printTable, summary, timeEach, type Check } from './bench/measure';

const num = (name: string, fallback: number) => {
  const v = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(v) || v <= 0) throw new Error(`${name} must be a positive whole number`);
  return v;
};

/** A small seeded PRNG (mulberry32) so a run's samples can be repeated. */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function waitForHealth(base: string, child: ReturnType<typeof spawn>): Promise<void> {
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`the app exited early (code ${child.exitCode})`);
    try {
      const res = await fetch(`${base}/api/health`);
      if (res.status === 200) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('the app did not answer /api/health within 60 s');
}

runMain(async () => {
  const shape = { days: num('TACKLOG_BENCH_DAYS', 1095), driversPerDay: num('TACKLOG_BENCH_PER_DAY', 2000), batchSize: 200 };
  const driverSamples = num('TACKLOG_BENCH_DRIVER_SAMPLES', 200);
  const lotSamples = num('TACKLOG_BENCH_LOT_SAMPLES', 50);
  const seed = num('TACKLOG_BENCH_SEED', 20260301);
  const rand = prng(seed);

  const server = await providePostgres('throwaway');
  const reuse = process.env.TACKLOG_BENCH_DATABASE;
  const keep = Boolean(reuse) || process.env.TACKLOG_BENCH_KEEP === '1';
  const dbName = reuse || `tacklog_bench_${crypto.randomBytes(4).toString('hex')}`;
  if (reuse && !/^tacklog_bench_[a-z0-9_]+$/.test(reuse)) throw new Error('TACKLOG_BENCH_DATABASE must name a benchmark database (tacklog_bench_…)');
  const url = await ensureDatabase(server, dbName);
  if (!keep) {
    onShutdown(async () => {
      await dropDatabase(server, dbName);
      log(`dropped the benchmark database ${dbName}`);
    });
  } else if (server.startedHere) {
    log('note: the throwaway cluster is removed at exit; keeping a database needs DATABASE_URL');
  }
  const { runMigrations } = await import('../server/db/migrate');
  await runMigrations(url);

  // ---------------------------------------------------------------- seed
  const password = crypto.randomBytes(12).toString('hex');
  const passwordHash = bcrypt.hashSync(password, 10);
  const seedClient = new pg.Client({ connectionString: url });
  await seedClient.connect();
  let seedSeconds = 0;
  const already = (await seedClient.query('SELECT count(*)::int AS n FROM build_batches')).rows[0].n as number;
  if (already > 0) {
    log(`${dbName} already holds a history: measuring it as it is`);
    await seedClient.query(`UPDATE users SET password_hash = $1 WHERE email = 'bench-quality@tacklog.test'`, [passwordHash]);
  } else {
    log(`seeding ${shape.days} days × ${shape.driversPerDay} drivers a day (batches of ${shape.batchSize}) into ${dbName}:`);
    const seedStart = Date.now();
    await seedHistory(seedClient, shape, passwordHash, (m) => console.log(m));
    seedSeconds = (Date.now() - seedStart) / 1000;
  }
  const sizes = await seedClient.query(
    `SELECT (SELECT count(*) FROM drivers)::int AS drivers, (SELECT count(*) FROM build_batches)::int AS batches,
            (SELECT count(*) FROM step_runs)::int AS runs, (SELECT count(*) FROM step_run_materials)::int AS uses,
            (SELECT count(*) FROM test_results)::int AS tests, (SELECT count(*) FROM lots)::int AS lots,
            (SELECT count(*) FROM containers)::int AS containers, pg_size_pretty(pg_database_size(current_database())) AS size,
            (SELECT max(quantity) FROM build_batches)::int AS batch_size,
            (SELECT count(DISTINCT created_at::date) FROM build_batches)::int AS days`,
  );
  await seedClient.end();
  const sz = sizes.rows[0];
  const seeded = { batches: sz.batches as number };
  shape.batchSize = sz.batch_size;
  shape.days = sz.days;
  log(`${seedSeconds ? `seeded in ${seedSeconds.toFixed(1)} s` : 'history'}: ${sz.drivers} drivers, ${sz.batches} batches, ${sz.runs} step runs, ${sz.uses} material uses, ${sz.tests} final tests, ${sz.lots} lots, ${sz.containers} containers (${sz.size})`);

  // ---------------------------------------------------------------- the real app
  const port = await freePort();
  // As scripts/start.ts runs it: `node --import tsx`, one process in its own group.
  const app = spawn(process.execPath, ['--import', 'tsx', path.join('server', 'index.ts')], {
    cwd: root,
    stdio: CHILD_STDIO,
    detached: true,
    env: {
      ...process.env,
      DATABASE_URL: url,
      PORT: String(port),
      TACKLOG_SERVE_CLIENT: '0',
      TACKLOG_WATCH_CRON: 'off',
      TACKLOG_JWT_SECRET: crypto.randomBytes(32).toString('hex'),
      NODE_ENV: 'production',
    },
  });
  onShutdown(() => stopChild(app));
  const base = `http://127.0.0.1:${port}`;
  await waitForHealth(base, app);
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'bench-quality@tacklog.test', password }),
  });
  if (login.status !== 200) throw new Error(`sign-in failed: ${login.status} ${await login.text()}`);
  const { token } = (await login.json()) as { token: string };
  const headers = { authorization: `Bearer ${token}` };

  // ---------------------------------------------------------------- the same statements, bare
  // The services' own statements, as the same named prepared statements, on a pool of our own.
  process.env.DATABASE_URL = url;
  const { driverTraceQueries, DRIVER_TRACE_STATEMENTS } = await import('../server/services/trace/driver-trace');
  const { lotTraceQueries, LOT_TRACE_STATEMENTS } = await import('../server/services/trace/lot-trace');
  const { namedQuery } = await import('../server/services/trace/statements');
  const pool = new pg.Pool({ connectionString: url, max: 3 });
  onShutdown(() => pool.end());
  const bare = (prefix: string, statements: Record<string, SQL>) =>
    Promise.all(Object.entries(statements).map(([k, q]) => pool.query(namedQuery(`${prefix}_${k}`, q))));
  const bareDriver = (serial: string) => bare(DRIVER_TRACE_STATEMENTS, driverTraceQueries(serial));
  const bareLot = (lotId: string) => bare(LOT_TRACE_STATEMENTS, lotTraceQueries(lotId));
  const apiGet = async (p: string) => {
    const res = await fetch(`${base}${p}`, { headers });
    const text = await res.text();
    if (res.status !== 200) throw new Error(`GET ${p}: ${res.status} ${text.slice(0, 200)}`);
    return text;
  };

  // ---------------------------------------------------------------- samples
  const serials = Array.from({ length: driverSamples }, () =>
    benchSerial(Math.floor(rand() * seeded.batches), 1 + Math.floor(rand() * shape.batchSize)),
  );
  const ca = BENCH_MATERIALS.find((m) => m.key === 'CA')!;
  const caLots = Math.floor(seeded.batches / (ca.batchesPerContainer * ca.containersPerLot));
  const lotNumbers = Array.from({ length: lotSamples }, () => 1 + Math.floor(rand() * Math.max(1, caLots - 2)));
  const lotRows = await pool.query<{ id: string; supplier_lot: string }>('SELECT id, supplier_lot FROM lots WHERE supplier_lot = ANY($1)', [
    lotNumbers.map((n) => benchSupplierLot('CA', n)),
  ]);
  const lotIdBySupplierLot = new Map(lotRows.rows.map((r) => [r.supplier_lot, r.id]));
  const lotIds = lotNumbers.map((n) => lotIdBySupplierLot.get(benchSupplierLot('CA', n))!);

  // Sanity: the traces say what the seed built.
  const one = JSON.parse(await apiGet(`/api/lots/${lotIds[0]}/trace`)) as { drivers: unknown[]; batches: unknown[] };
  const back = JSON.parse(await apiGet(`/api/drivers/${serials[0]}/trace`)) as { steps: { materials: unknown[] }[] };
  log(`sample lot ${benchSupplierLot('CA', lotNumbers[0])} reaches ${one.drivers.length} drivers in ${one.batches.length} batches; sample driver ${serials[0]} has ${back.steps.length} step runs, ${back.steps.reduce((n, s) => n + s.materials.length, 0)} material entries`);

  // ---------------------------------------------------------------- warm-up, then measure
  log('warming up');
  const warmSerials = serials.slice(0, 20);
  const warmLots = lotIds.slice(0, 5);
  await timeEach(warmSerials, (s) => apiGet(`/api/drivers/${s}/trace`));
  await timeEach(warmSerials, bareDriver);
  await timeEach(warmLots, (id) => apiGet(`/api/lots/${id}/trace`));
  await timeEach(warmLots, bareLot);

  log(`measuring ${serials.length} backward and ${lotIds.length} forward traces`);
  const driverApi = await timeEach(serials, (s) => apiGet(`/api/drivers/${s}/trace`));
  const driverSql = await timeEach(serials, bareDriver);
  let reached = 0;
  const lotApi = await timeEach(lotIds, async (id) => {
    reached += (JSON.parse(await apiGet(`/api/lots/${id}/trace`)) as { drivers: unknown[] }).drivers.length;
  });
  const lotSql = await timeEach(lotIds, bareLot);
  // The floor under any signed-in request (HTTP, session check, JSON): GET /api/auth/me.
  const floor = summary(await timeEach(serials, () => apiGet('/api/auth/me')));

  console.log('');
  console.log(`Tacklog trace benchmark — ${sz.drivers.toLocaleString('en')} drivers over ${shape.days} days${seedSeconds ? `, seeded in ${seedSeconds.toFixed(1)} s` : ' (database reused)'};`);
  console.log(`forward traces reached ${Math.round(reached / lotIds.length).toLocaleString('en')} drivers per lot on average.`);
  console.log('');
  const d = { api: summary(driverApi), sql: summary(driverSql) };
  const l = { api: summary(lotApi), sql: summary(lotSql) };
  const checks: Check[] = [
    { what: 'backward trace (driver), API p95', value: d.api.p95, limit: 50, unit: 'ms' },
    { what: 'forward trace (lot in ~5,000 drivers), API p95', value: l.api.p95, limit: 500, unit: 'ms' },
    { what: 'backward trace, API p95 / bare SQL p95', value: d.api.p95 / d.sql.p95, limit: 3, unit: '×' },
    { what: 'forward trace, API p95 / bare SQL p95', value: l.api.p95 / l.sql.p95, limit: 3, unit: '×' },
  ];
  const met = printTable(
    [
      { label: 'backward: GET /api/drivers/:serial/trace', n: serials.length, api: driverApi, sql: driverSql },
      { label: 'forward:  GET /api/lots/:id/trace', n: lotIds.length, api: lotApi, sql: lotSql },
    ],
    checks,
  );
  console.log(`  (for scale: GET /api/auth/me, the session check alone, p50 ${floor.p50.toFixed(1)} ms, p95 ${floor.p95.toFixed(1)} ms)`);
  console.log('');
  return met ? 0 : 1;
});
