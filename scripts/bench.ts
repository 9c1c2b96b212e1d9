/**
 * `npm run bench`: Tacklog's benchmark, everything in one run on a freshly generated history.
 *
 * Seeds a large invented history into a throwaway database (a throwaway cluster, or a database
 * of its own on DATABASE_URL's server, dropped afterwards), runs Debian's pgbench (TPC-B-like and
 * select-only) on the same server, then starts the real app (as `npm start` runs it) with
 * TACKLOG_WORKERS=1 and again with one worker per core, and measures at 16 concurrent clients
 * over loopback: the station scan as the station screen sends it (POST /api/stations/:id/load of a
 * fresh sealed container with an Idempotency-Key, with its audit), the scan lookup
 * (POST /api/scans/resolve), a reading (POST /api/readings), through wrk (scripts/bench/wrk.ts);
 * beside them the ceilings of the stack itself (scripts/bench/bare-express.ts: Express and
 * node-postgres running the lookup's statement and a reading's write, nothing of Tacklog's);
 * the traces one at a time through the API and as bare SQL; a full compliance sweep; the server's
 * RSS (and proportional share) under load; the initial route's JS + CSS gzip size and first paint in Chromium.
 * Prints a table, then as its last line one JSON object (scanPerSec, scanP99Ms, pgbenchTps,
 * scanRatio, lookupPerSec, lookupP99Ms, pgbenchSelectTps, lookupRatio, sweepMs, rssMb,
 * initialRouteGzipKb, driverTraceP95Ms, driverTraceRatio, lotTraceP95Ms, lotTraceRatio, workers).
 * Exit code 0 when every target is met, 1 when one is missed.
 *
 * `--quick`: 90 days of history and short load phases (under 2 minutes).
 * Knobs: TACKLOG_BENCH_DAYS (1095), TACKLOG_BENCH_PER_DAY (2000), TACKLOG_BENCH_DRIVER_SAMPLES
 * (200), TACKLOG_BENCH_LOT_SAMPLES (50), TACKLOG_BENCH_SEED (sampling), TACKLOG_BENCH_CLIENTS (16),
 * TACKLOG_BENCH_SECONDS (load phase length), TACKLOG_BENCH_WORKERS (the N, default one per core).
 * For working on the queries: TACKLOG_BENCH_KEEP=1 keeps the seeded database (its name is
 * printed) and TACKLOG_BENCH_DATABASE=<that name> measures it again without seeding.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import bcrypt from 'bcryptjs';
import pg from 'pg';
import type { SQL } from 'drizzle-orm';
import { dropDatabase, ensureDatabase, freePort, providePostgres } from './pg';
import { log, onShutdown, root, runMain, stopChild } from './lib/proc';
import { buildClientIfStale } from './lib/app';
import { BENCH_MATERIALS, benchSerial, benchSupplierLot, seedHistory } from './bench/seed-history';
import { seedStationFixture } from './bench/seed-station';
import { printTable, summary, timeEach, type Check } from './bench/measure';
import type { LoadResult } from './bench/load';
import { ensureWrk, wrkPhase, type WrkRun } from './bench/wrk';
import { findPgbench, pgbenchInit, pgbenchRun } from './bench/pgbench';
import { buildServerIfStale, serverCommand } from './lib/server-build';
import { CHROMIUM, ensureChromium } from './lib/apt';

const quick = process.argv.includes('--quick');

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

async function waitForHealth(base: string, child: ChildProcess): Promise<void> {
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

/** A process and its children (the cluster's workers), from /proc. */
function processTree(pid: number): number[] {
  const pids = [pid];
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      if (ppid === pid) pids.push(Number(entry));
    } catch {
      // gone
    }
  }
  return pids;
}

/** A /proc field in kB as MB (0 when the process is gone). */
function procMb(file: string, field: RegExp): number {
  try {
    const m = field.exec(fs.readFileSync(file, 'utf8'));
    return m ? Number(m[1]) / 1024 : 0;
  } catch {
    return 0;
  }
}

/**
 * Memory of a process tree in MB: `rss`, each process's resident set added up (what the target
 * is measured by: pages the processes share, such as Node's own code, count once per process),
 * and `pss`, each process's proportional share (shared pages divided among the processes that
 * map them: what the tree takes from the machine).
 */
function treeMemoryMb(pid: number): { rss: number; pss: number } {
  let rss = 0;
  let pss = 0;
  for (const p of processTree(pid)) {
    rss += procMb(`/proc/${p}/status`, /VmRSS:\s+(\d+) kB/);
    pss += procMb(`/proc/${p}/smaps_rollup`, /^Pss:\s+(\d+) kB/m);
  }
  return { rss, pss };
}

/** Samples `treeMemoryMb(pid)` every 250 ms while `work` runs; resolves to the work's result and the peaks. */
async function withPeakRss<T>(pid: number, work: () => Promise<T>): Promise<{ result: T; peakMb: number; peakPssMb: number }> {
  let peakMb = 0;
  let peakPssMb = 0;
  const sample = () => {
    const m = treeMemoryMb(pid);
    peakMb = Math.max(peakMb, m.rss);
    peakPssMb = Math.max(peakPssMb, m.pss);
  };
  sample();
  const timer = setInterval(sample, 250);
  try {
    const result = await work();
    sample();
    return { result, peakMb, peakPssMb };
  } finally {
    clearInterval(timer);
  }
}

interface RunningApp {
  base: string;
  child: ChildProcess;
  stop: () => Promise<void>;
}

/** The real app as `npm start` runs it, with `workers` processes, its log in .tmp/. */
async function startApp(url: string, jwtSecret: string, workers: number): Promise<RunningApp> {
  const port = await freePort();
  const logFile = path.join(root, '.tmp', `bench-server-${workers}w.log`);
  fs.mkdirSync(path.dirname(logFile), { recursive: true });
  const out = fs.openSync(logFile, 'w');
  const [cmd, args] = serverCommand();
  const child = spawn(cmd, args, {
    cwd: root,
    stdio: ['ignore', out, 'inherit'],
    detached: true,
    env: {
      ...process.env,
      DATABASE_URL: url,
      PORT: String(port),
      TACKLOG_SERVE_CLIENT: '1',
      TACKLOG_WATCH_CRON: 'off',
      TACKLOG_JWT_SECRET: jwtSecret,
      TACKLOG_WORKERS: String(workers),
      NODE_ENV: 'production',
    },
  });
  fs.closeSync(out);
  const stop = () => stopChild(child);
  onShutdown(stop);
  const base = `http://127.0.0.1:${port}`;
  await waitForHealth(base, child);
  // Every worker answering: a few health checks spread over the processes.
  await Promise.all(Array.from({ length: 4 * workers }, () => fetch(`${base}/api/health`).then((r) => r.text())));
  return { base, child, stop };
}

interface Ceilings {
  load: LoadResult;
  echo: LoadResult;
  lookup: LoadResult;
  reading: LoadResult;
}

/**
 * For scale: the same load against an Express app with nothing but a JSON body parser
 * (scripts/bench/bare-express.ts), one process: a bare echo, and the scan lookup's own statement
 * and a reading's write each answered as they come — what Express and node-postgres allow on this
 * machine before Tacklog does anything of its own (sign-in, checks, headers, log, mapping).
 */
async function measureCeilings(
  url: string,
  lanes: { actorIds: string[]; stationIds: string[]; batchIds: string[] },
  codes: { fresh: string[]; lookup: string[] },
  clients: number,
  warmupSeconds: number,
  seconds: number,
): Promise<Ceilings> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'scripts', 'bench', 'bare-express.ts')], {
    cwd: root,
    stdio: ['ignore', 'pipe', 'inherit'],
    env: { ...process.env, PORT: String(port), NODE_ENV: 'production', DATABASE_URL: url, TACKLOG_BENCH_ACTOR_ID: lanes.actorIds[0] },
  });
  try {
    await new Promise<void>((resolve, reject) => {
      child.stdout!.on('data', (b: Buffer) => b.toString().includes('ready') && resolve());
      child.on('exit', (code) => reject(new Error(`the bare Express app exited (code ${code})`)));
    });
    const base = `http://127.0.0.1:${port}`;
    const phase = (p: WrkRun['phase'], expect: number, list = codes.lookup) =>
      wrkPhase(
        {
          base,
          phase: p,
          clients,
          seconds,
          expect,
          codes: list,
          tokens: lanes.actorIds,
          stationIds: lanes.stationIds,
          batchIds: lanes.batchIds,
        },
        warmupSeconds,
      );
    return {
      load: await phase('ceiling-load', 200, codes.fresh),
      lookup: await phase('ceiling-lookup', 200),
      reading: await phase('ceiling-reading', 201),
      echo: await phase('echo', 200),
    };
  } finally {
    await stopChild(child);
  }
}

async function signIn(base: string, email: string, password: string): Promise<string> {
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (login.status !== 200) throw new Error(`sign-in of ${email} failed: ${login.status} ${await login.text()}`);
  return ((await login.json()) as { token: string }).token;
}

/** The initial route as a fresh browser gets it: JS + CSS it loads (gzip -6 sizes) and first contentful paint. */
async function measureFirstPage(
  base: string,
): Promise<{ gzipKb: number; rawKb: number; sentCompressed: boolean; fcpMs: number | null; files: number }> {
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--no-first-run',
      '--disable-sync',
    ],
  });
  try {
    const page = await browser.newPage();
    const assets: { url: string; encoding: string | undefined }[] = [];
    page.on('response', (res) => {
      const type = res.request().resourceType();
      if (type === 'script' || type === 'stylesheet') assets.push({ url: res.url(), encoding: res.headers()['content-encoding'] });
    });
    await page.goto(`${base}/`, { waitUntil: 'networkidle' });
    const fcp = await page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? null);
    let gzip = 0;
    let raw = 0;
    for (const a of assets) {
      const body = Buffer.from(await (await fetch(a.url)).arrayBuffer());
      raw += body.length;
      gzip += zlib.gzipSync(body, { level: 6 }).length;
    }
    return {
      gzipKb: gzip / 1024,
      rawKb: raw / 1024,
      sentCompressed: assets.length > 0 && assets.every((a) => a.encoding === 'gzip' || a.encoding === 'br'),
      fcpMs: fcp,
      files: assets.length,
    };
  } finally {
    await browser.close();
  }
}

runMain(async () => {
  const shape = {
    days: num('TACKLOG_BENCH_DAYS', quick ? 90 : 1095),
    driversPerDay: num('TACKLOG_BENCH_PER_DAY', 2000),
    batchSize: 200,
  };
  const driverSamples = num('TACKLOG_BENCH_DRIVER_SAMPLES', quick ? 60 : 200);
  const lotSamples = num('TACKLOG_BENCH_LOT_SAMPLES', quick ? 12 : 50);
  const seed = num('TACKLOG_BENCH_SEED', 20260301);
  const clients = num('TACKLOG_BENCH_CLIENTS', 16);
  const seconds = num('TACKLOG_BENCH_SECONDS', quick ? 4 : 20);
  const warmupSeconds = quick ? 1 : 5;
  const nWorkers = num('TACKLOG_BENCH_WORKERS', os.availableParallelism());
  const rand = prng(seed);

  const server = await providePostgres('throwaway');
  const reuse = process.env.TACKLOG_BENCH_DATABASE;
  const keep = Boolean(reuse) || process.env.TACKLOG_BENCH_KEEP === '1';
  const dbName = reuse || `tacklog_bench_${crypto.randomBytes(4).toString('hex')}`;
  if (reuse && !/^tacklog_bench_[a-z0-9_]+$/.test(reuse))
    throw new Error('TACKLOG_BENCH_DATABASE must name a benchmark database (tacklog_bench_…)');
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
  // The first-page measurement drives Debian's chromium and the load phases Debian's wrk:
  // installed now, not beside a measurement.
  await ensureChromium('The first-page measurement');
  await ensureWrk();
  // Both builds before anything is measured: a build running beside a measurement takes its CPU.
  await buildServerIfStale();
  await buildClientIfStale();

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
  // Enough fresh containers for the loading phases (with their warm-ups: the ceiling's, then the
  // app's at both worker counts), at a generous rate, and 2,000 more for the lookups.
  const lookupCount = 2000;
  const station = await seedStationFixture(
    seedClient,
    passwordHash,
    lookupCount + Math.max(30_000, 3 * 4000 * (seconds + warmupSeconds)),
    clients,
  );
  const idByEmail = new Map(
    (
      await seedClient.query<{ id: string; email: string }>('SELECT id, email FROM users WHERE email = ANY($1)', [station.assemblers])
    ).rows.map((r) => [r.email, r.id]),
  );
  const assemblerIds = station.assemblers.map((e) => idByEmail.get(e)!);
  const sizes = await seedClient.query(
    `SELECT (SELECT count(*) FROM drivers)::int AS drivers, (SELECT count(*) FROM build_batches)::int AS batches,
            (SELECT count(*) FROM step_runs)::int AS runs, (SELECT count(*) FROM step_run_materials)::int AS uses,
            (SELECT count(*) FROM test_results)::int AS tests, (SELECT count(*) FROM lots)::int AS lots,
            (SELECT count(*) FROM containers)::int AS containers, pg_size_pretty(pg_database_size(current_database())) AS size,
            (SELECT max(quantity) FROM build_batches)::int AS batch_size,
            (SELECT count(DISTINCT created_at::date) FROM build_batches WHERE status = 'completed')::int AS days,
            (SELECT count(*) FROM build_batches WHERE status = 'completed')::int AS history_batches`,
  );
  await seedClient.end();
  const sz = sizes.rows[0];
  const seeded = { batches: sz.history_batches as number };
  shape.batchSize = sz.batch_size;
  shape.days = sz.days;
  log(
    `${seedSeconds ? `seeded in ${seedSeconds.toFixed(1)} s` : 'history'}: ${sz.drivers} drivers, ${sz.batches} batches, ${sz.runs} step runs, ${sz.uses} material uses, ${sz.tests} final tests, ${sz.lots} lots, ${sz.containers} containers (${sz.size})`,
  );

  // ---------------------------------------------------------------- pgbench on the same server
  const pgbench = findPgbench();
  const pgbName = `${dbName}_pgbench`;
  const pgbUrl = await ensureDatabase(server, pgbName);
  onShutdown(() => dropDatabase(server, pgbName));
  log(
    `pgbench: initializing scale ${clients} (one branch per client), then TPC-B-like and select-only, ${clients} clients, ${seconds} s each`,
  );
  await pgbenchInit(pgbench, pgbUrl, clients);
  const tpcb = await pgbenchRun(pgbench, pgbUrl, { clients, seconds, select: false });
  const selectOnly = await pgbenchRun(pgbench, pgbUrl, { clients, seconds, select: true });
  await dropDatabase(server, pgbName);
  log(`pgbench: TPC-B-like ${tpcb.tps.toFixed(0)} tps, select-only ${selectOnly.tps.toFixed(0)} tps`);

  // The lookups' codes: containers no load phase takes (those come from the front of the list).
  const lookupCodes = station.codes.slice(-lookupCount);
  const freshCodes = station.codes.slice(0, -lookupCount);
  const jwtSecret = crypto.randomBytes(32).toString('hex');

  // ---------------------------------------------------------------- load phases (scan, lookup, reading)
  // One lane per connection: its own assembler at their own station, loading onto their own batch.
  const loadPhases = async (app: RunningApp, tokens: string[]) => {
    const run = (phase: WrkRun['phase'], expect: number, codes: string[]) =>
      wrkPhase(
        {
          base: app.base,
          phase,
          clients,
          seconds,
          expect,
          tokens,
          codes,
          stationIds: station.stationIds,
          batchIds: station.batchIds,
        },
        warmupSeconds,
      );
    // A station scan as the station screen sends it: the screen knows a container code by its look
    // (src/stores/station-scan.ts, interpretScan) and sends one load with an Idempotency-Key (its
    // offline queue retries with it); the load's answer carries the container, lot and material.
    // Each load takes the next fresh sealed container (freshCodes loses what was used).
    const scanRun = await withPeakRss(app.child.pid!, () => run('load', 200, freshCodes));
    const lookupRun = await withPeakRss(app.child.pid!, () => run('lookup', 200, lookupCodes));
    const readingRun = await withPeakRss(app.child.pid!, () => run('reading', 201, lookupCodes));
    return {
      scan: scanRun.result,
      lookup: lookupRun.result,
      reading: readingRun.result,
      rssMb: Math.max(scanRun.peakMb, lookupRun.peakMb, readingRun.peakMb),
      pssMb: Math.max(scanRun.peakPssMb, lookupRun.peakPssMb, readingRun.peakPssMb),
    };
  };

  // ---------------------------------------------------------------- one worker: traces, sweep, first page, load
  log('starting the app with TACKLOG_WORKERS=1');
  const one = await startApp(url, jwtSecret, 1);
  const quality = await signIn(one.base, 'bench-quality@tacklog.test', password);
  const assemblers = await Promise.all(station.assemblers.map((email) => signIn(one.base, email, password)));
  const headers = { authorization: `Bearer ${quality}` };

  // The same statements, bare: the services' own statements, as the same named prepared statements, on a pool of our own.
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
    const res = await fetch(`${one.base}${p}`, { headers });
    const text = await res.text();
    if (res.status !== 200) throw new Error(`GET ${p}: ${res.status} ${text.slice(0, 200)}`);
    return text;
  };

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
  const sample = JSON.parse(await apiGet(`/api/lots/${lotIds[0]}/trace`)) as { drivers: unknown[]; batches: unknown[] };
  const back = JSON.parse(await apiGet(`/api/drivers/${serials[0]}/trace`)) as { steps: { materials: unknown[] }[] };
  log(
    `sample lot ${benchSupplierLot('CA', lotNumbers[0])} reaches ${sample.drivers.length} drivers in ${sample.batches.length} batches; sample driver ${serials[0]} has ${back.steps.length} step runs, ${back.steps.reduce((n, s) => n + s.materials.length, 0)} material entries`,
  );

  log('traces: warming up');
  const warmSerials = serials.slice(0, 20);
  const warmLots = lotIds.slice(0, 5);
  await timeEach(warmSerials, (s) => apiGet(`/api/drivers/${s}/trace`));
  await timeEach(warmSerials, bareDriver);
  await timeEach(warmLots, (id) => apiGet(`/api/lots/${id}/trace`));
  await timeEach(warmLots, bareLot);
  log(`traces: measuring ${serials.length} backward and ${lotIds.length} forward traces, one at a time`);
  const driverApi = await timeEach(serials, (s) => apiGet(`/api/drivers/${s}/trace`));
  const driverSql = await timeEach(serials, bareDriver);
  let reached = 0;
  const lotApi = await timeEach(lotIds, async (id) => {
    reached += (JSON.parse(await apiGet(`/api/lots/${id}/trace`)) as { drivers: unknown[] }).drivers.length;
  });
  const lotSql = await timeEach(lotIds, bareLot);
  const floor = summary(await timeEach(serials, () => apiGet('/api/auth/me')));

  const memoryNow = () => {
    const m = treeMemoryMb(one.child.pid!);
    return `${m.rss.toFixed(0)} MB (proportional share ${m.pss.toFixed(0)} MB)`;
  };
  log(`server memory after the traces: ${memoryNow()}`);
  log("compliance sweep: three full sweeps (the first raises the history's alerts)");
  const raisedBySweep: number[] = [];
  const sweeps = await timeEach([1, 2, 3], async () => {
    const res = await fetch(`${one.base}/api/compliance/run`, { method: 'POST', headers });
    if (res.status !== 200) throw new Error(`compliance run: ${res.status} ${await res.text()}`);
    const r = (await res.json()) as { ran: boolean; raised: number; resolved: number };
    if (!r.ran) throw new Error('the compliance sweep did not run (its lock was taken)');
    raisedBySweep.push(r.raised);
  });

  log(`server memory after the sweeps (alerts raised: ${raisedBySweep.join(', ')}): ${memoryNow()}`);
  log('first page: a fresh Chromium opens /');
  const firstPage = await measureFirstPage(one.base);

  log(
    `load at ${clients} clients (wrk), TACKLOG_WORKERS=1: station scans, scan lookups, readings (${seconds} s each after ${warmupSeconds} s warm-up)`,
  );
  log(`server memory before the load phases: ${memoryNow()}`);
  const at1 = await loadPhases(one, assemblers);
  await one.stop();

  let atN: typeof at1 | null = null;
  if (nWorkers > 1) {
    log(`starting the app with TACKLOG_WORKERS=${nWorkers}`);
    const many = await startApp(url, jwtSecret, nWorkers);
    log(`load at ${clients} clients (wrk), TACKLOG_WORKERS=${nWorkers}`);
    atN = await loadPhases(many, assemblers);
    await many.stop();
  }

  // The ceilings last, on the database as the app's phases left it (not just after seeding).
  const ceiling = await measureCeilings(
    url,
    { actorIds: assemblerIds, stationIds: station.stationIds, batchIds: station.batchIds },
    { fresh: freshCodes, lookup: lookupCodes },
    clients,
    warmupSeconds,
    seconds,
  );
  log(
    `bare Express, one process: a load's statements ${ceiling.load.perSec.toFixed(0)}/s, the lookup's statement ${ceiling.lookup.perSec.toFixed(0)}/s, a reading's write ${ceiling.reading.perSec.toFixed(0)}/s, echo ${ceiling.echo.perSec.toFixed(0)}/s`,
  );
  for (const [what, r] of Object.entries(ceiling))
    if (r.errors) throw new Error(`bare Express ${what}: ${r.errors} failed requests; the first: ${r.firstError}`);

  // ---------------------------------------------------------------- report
  const d = { api: summary(driverApi), sql: summary(driverSql) };
  const l = { api: summary(lotApi), sql: summary(lotSql) };
  const best = atN && atN.scan.perSec > at1.scan.perSec ? { w: nWorkers, r: atN } : { w: 1, r: at1 };
  const sweepMs = Math.max(...sweeps);
  const result = {
    scanPerSec: Math.round(best.r.scan.perSec),
    scanP99Ms: +best.r.scan.p99.toFixed(1),
    pgbenchTps: Math.round(tpcb.tps),
    scanRatio: +(best.r.scan.perSec / tpcb.tps).toFixed(3),
    lookupPerSec: Math.round(best.r.lookup.perSec),
    lookupP99Ms: +best.r.lookup.p99.toFixed(1),
    pgbenchSelectTps: Math.round(selectOnly.tps),
    lookupRatio: +(best.r.lookup.perSec / selectOnly.tps).toFixed(3),
    sweepMs: Math.round(sweepMs),
    rssMb: Math.round(best.r.rssMb),
    pssMb: Math.round(best.r.pssMb),
    initialRouteGzipKb: +firstPage.gzipKb.toFixed(1),
    driverTraceP95Ms: +d.api.p95.toFixed(1),
    driverTraceRatio: +(d.api.p95 / d.sql.p95).toFixed(2),
    lotTraceP95Ms: +l.api.p95.toFixed(1),
    lotTraceRatio: +(l.api.p95 / l.sql.p95).toFixed(2),
    workers: best.w,
    bareExpressPerSec: Math.round(ceiling.echo.perSec),
    ceilingLoadPerSec: Math.round(ceiling.load.perSec),
    ceilingLoadRatio: +(ceiling.load.perSec / tpcb.tps).toFixed(3),
    ceilingLookupPerSec: Math.round(ceiling.lookup.perSec),
    ceilingLookupRatio: +(ceiling.lookup.perSec / selectOnly.tps).toFixed(3),
    ceilingReadingPerSec: Math.round(ceiling.reading.perSec),
    ceilingReadingRatio: +(ceiling.reading.perSec / tpcb.tps).toFixed(3),
  };

  console.log('');
  console.log(
    `Tacklog benchmark${quick ? ' (--quick)' : ''} — ${sz.drivers.toLocaleString('en')} drivers over ${shape.days} days${seedSeconds ? `, seeded in ${seedSeconds.toFixed(1)} s` : ' (database reused)'};`,
  );
  console.log(
    `${os.cpus().length} × ${os.cpus()[0]?.model.trim() ?? 'CPU'}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}; load: ${clients} clients over loopback, ${seconds} s per phase.`,
  );
  console.log('');
  const rows: string[][] = [['path', 'workers', 'per s', 'p50', 'p99', 'pgbench on the same server', 'ratio']];
  const loadRow = (label: string, w: number, r: LoadResult, base?: { name: string; tps: number }) =>
    rows.push([
      label,
      String(w),
      r.perSec.toFixed(0),
      `${r.p50.toFixed(1)} ms`,
      `${r.p99.toFixed(1)} ms`,
      base ? `${base.name} ${base.tps.toFixed(0)} tps` : '',
      base ? (r.perSec / base.tps).toFixed(3) : '',
    ]);
  for (const [w, r] of [[1, at1], ...(atN ? [[nWorkers, atN]] : [])] as [number, typeof at1][]) {
    loadRow('station scan (POST …/load, audited)', w, r.scan, { name: 'TPC-B-like', tps: tpcb.tps });
    loadRow('scan lookup (POST /api/scans/resolve)', w, r.lookup, { name: 'select-only', tps: selectOnly.tps });
    loadRow('a reading (POST /api/readings)', w, r.reading, { name: 'TPC-B-like', tps: tpcb.tps });
  }
  // The ceilings: Express and node-postgres with nothing of Tacklog's (scripts/bench/bare-express.ts).
  loadRow("bare Express: a load's two statements", 1, ceiling.load, { name: 'TPC-B-like', tps: tpcb.tps });
  loadRow("bare Express: the lookup's statement", 1, ceiling.lookup, { name: 'select-only', tps: selectOnly.tps });
  loadRow("bare Express: a reading's write", 1, ceiling.reading, { name: 'TPC-B-like', tps: tpcb.tps });
  loadRow('bare Express: echo, no database', 1, ceiling.echo, { name: 'select-only', tps: selectOnly.tps });
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const fmt = (r: string[]) =>
    `  ${r.map((cell, c) => (c === 0 || c === 5 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ')}`;
  console.log(fmt(rows[0]));
  console.log(`  ${widths.map((w) => '-'.repeat(w)).join('  ')}`);
  for (const r of rows.slice(1)) console.log(fmt(r));
  for (const [w, r] of [[1, at1], ...(atN ? [[nWorkers, atN]] : [])] as [number, typeof at1][]) {
    const errs = r.scan.errors + r.lookup.errors + r.reading.errors;
    if (errs)
      console.log(
        `  ${errs} failed requests at ${w} worker(s); the first: ${r.scan.firstError ?? r.lookup.firstError ?? r.reading.firstError}`,
      );
  }
  console.log('');
  console.log(`  forward traces reached ${Math.round(reached / lotIds.length).toLocaleString('en')} drivers per lot on average`);
  const checks: Check[] = [
    { what: 'backward trace (driver), API p95', value: d.api.p95, limit: 50, unit: 'ms' },
    { what: 'forward trace (lot in ~5,000 drivers), API p95', value: l.api.p95, limit: 500, unit: 'ms' },
    { what: 'backward trace, API p95 / bare SQL p95', value: d.api.p95 / d.sql.p95, limit: 3, unit: '×' },
    { what: 'forward trace, API p95 / bare SQL p95', value: l.api.p95 / l.sql.p95, limit: 3, unit: '×' },
  ];
  let met = printTable(
    [
      { label: 'backward: GET /api/drivers/:serial/trace', n: serials.length, api: driverApi, sql: driverSql },
      { label: 'forward:  GET /api/lots/:id/trace', n: lotIds.length, api: lotApi, sql: lotSql },
    ],
    checks,
  );
  const more: { what: string; ok: boolean; text: string }[] = [
    {
      what: `station scans per s / pgbench TPC-B-like tps (${best.w} worker${best.w > 1 ? 's' : ''})`,
      ok: result.scanRatio >= 0.3,
      text: `${result.scanRatio} (target ≥ 0.30)`,
    },
    { what: 'station scan p99', ok: result.scanP99Ms < 50, text: `${result.scanP99Ms} ms (target < 50 ms)` },
    { what: 'scan lookups per s / pgbench select-only tps', ok: result.lookupRatio >= 0.1, text: `${result.lookupRatio} (target ≥ 0.10)` },
    { what: 'scan lookup p99', ok: result.lookupP99Ms < 25, text: `${result.lookupP99Ms} ms (target < 25 ms)` },
    {
      what: `full compliance sweep, slowest of 3 (${sweeps.map((s) => s.toFixed(0)).join(', ')} ms)`,
      ok: sweepMs < 2000,
      text: `${result.sweepMs} ms (target < 2,000 ms)`,
    },
    {
      what: `server RSS under load, all processes (${best.w} worker${best.w > 1 ? 's' : ''}${atN ? `; ${best.w === 1 ? nWorkers : 1}: ${Math.round((best.w === 1 ? atN : at1).rssMb)} MB` : ''})`,
      ok: result.rssMb < 250,
      text: `${result.rssMb} MB (target < 250 MB; proportional share, shared pages once: ${result.pssMb} MB)`,
    },
    {
      what: `initial route JS + CSS, gzip (${firstPage.files} files, ${firstPage.rawKb.toFixed(0)} KB raw)`,
      ok: result.initialRouteGzipKb <= 350,
      text: `${result.initialRouteGzipKb} KB (target ≤ 350 KB)`,
    },
    { what: 'initial route sent compressed', ok: firstPage.sentCompressed, text: firstPage.sentCompressed ? 'yes' : 'no' },
    {
      what: 'fresh page: first contentful paint',
      ok: firstPage.fcpMs !== null && firstPage.fcpMs < 1000,
      text: firstPage.fcpMs === null ? 'not reported' : `${firstPage.fcpMs.toFixed(0)} ms (target < 1,000 ms)`,
    },
  ];
  for (const m of more) {
    met &&= m.ok;
    console.log(`  ${m.ok ? 'MET   ' : 'MISSED'}  ${m.what}: ${m.text}`);
  }
  console.log(
    `  (for scale: a reading, one statement with its audit row, reaches ${(best.r.reading.perSec / tpcb.tps).toFixed(3)} × pgbench TPC-B-like at ${best.w} worker${best.w > 1 ? 's' : ''})`,
  );
  console.log(
    `  (for scale: GET /api/auth/me, the session check alone, p50 ${floor.p50.toFixed(1)} ms, p95 ${floor.p95.toFixed(1)} ms; server log in .tmp/bench-server-*.log)`,
  );
  console.log(
    `  (the ceiling: an Express app with only a JSON parser, running the scan lookup's own statement, answers ${(ceiling.lookup.perSec / selectOnly.tps).toFixed(3)} × pgbench select-only; ` +
      `Tacklog's lookup reaches ${((best.r.lookup.perSec / ceiling.lookup.perSec) * 100).toFixed(0)} % of it; the station load's own two statements behind it answer ${(ceiling.load.perSec / tpcb.tps).toFixed(3)} × TPC-B-like, and Tacklog's station scan reaches ${((best.r.scan.perSec / ceiling.load.perSec) * 100).toFixed(0)} % of that)`,
  );
  console.log('');
  console.log(JSON.stringify(result));
  return met ? 0 : 1;
});
