import cluster, { type Worker } from 'node:cluster';
import os from 'node:os';
import type { Server } from 'node:http';
import { config } from './config';
import { isDatabaseUnavailable, noteDatabaseDown } from './db/availability';
import { logger } from './logger';

// The app, the database and the watch are imported when needed: the primary of several workers
// loads none of them (it only supervises), so it stays small.

/** Starts the HTTP server (API and built client) on 127.0.0.1:PORT. */
export async function startServer(options: { serveClient?: boolean; port?: number } = {}): Promise<Server> {
  const { createApp } = await import('./app');
  const { httpServerFor } = await import('./http-server');
  const { startSessionCache } = await import('./services/auth/session-cache');
  const app = createApp({ serveClient: options.serveClient ?? true });
  // Not awaited: the server listens at once; until the cache listens (or while the database is
  // away) every request asks the database, as without it.
  void startSessionCache();
  const port = options.port ?? config.port;
  return new Promise((resolve, reject) => {
    const server = httpServerFor(app).listen(port, config.host, () => resolve(server));
    server.on('error', reject);
  });
}

/**
 * A database outage must not end the process: whatever escapes as an unhandled rejection or
 * exception because PostgreSQL went away is logged (once per outage) and the server keeps
 * answering 503 until it is back. Anything else leaves the process in an unknown state: it exits,
 * and the supervisor (`npm start`, or the cluster primary) starts a fresh one.
 */
function keepRunningThroughDatabaseOutages(): void {
  const handle = (kind: string) => (err: unknown) => {
    if (isDatabaseUnavailable(err)) {
      noteDatabaseDown(err);
      return;
    }
    logger.fatal({ err }, `${kind}; exiting`);
    process.exit(1);
  };
  process.on('unhandledRejection', handle('unhandled rejection'));
  process.on('uncaughtException', handle('uncaught exception'));
}

/** TACKLOG_WORKERS: how many server processes answer HTTP (default: one per core). */
export function workerCount(): number {
  const raw = process.env.TACKLOG_WORKERS;
  if (raw === undefined || raw === '') return os.availableParallelism();
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 256) throw new Error(`TACKLOG_WORKERS must be a whole number from 1 to 256, got "${raw}"`);
  return n;
}

/**
 * The compliance watch: a first sweep at start, so alerts are current before the first scheduled
 * run, then on TACKLOG_WATCH_CRON. With several processes (here or on other machines) the
 * sweep's advisory lock lets exactly one of them work each time.
 */
async function startWatch(): Promise<() => void> {
  const [{ scheduleComplianceWatch }, { sweep }, mailJobs] = await Promise.all([
    import('./jobs/compliance'),
    import('./services/compliance'),
    import('./jobs/mail'),
  ]);
  // E-mail: the transport (a real SMTP server, or the local catcher), the outbox worker and the
  // daily digest run beside the watch, in one process of this machine.
  const mail = await mailJobs.startMailTransport();
  logger.info(
    `mail: sending through the ${mail.transport.describe}${mail.catcher ? ' (no TACKLOG_SMTP_URL: messages stay here; read them on the Mailbox page)' : ''}`,
  );
  const stopWorker = mailJobs.startOutboxWorker();
  const stopWatch = scheduleComplianceWatch(config.watchSchedule);
  let firstSweep: Promise<unknown> = Promise.resolve();
  if (config.watchSchedule !== 'off') {
    firstSweep = sweep().then(
      (r) => r.ran && logger.info({ job: 'watch', ...r }, `first sweep: raised ${r.raised}, resolved ${r.resolved}`),
      (err) => (isDatabaseUnavailable(err) ? noteDatabaseDown(err) : logger.error({ job: 'watch', err }, 'first sweep failed')),
    );
  }
  // Today's digest, if its time has passed, waits for the first sweep so it reports current alerts.
  const stopDigest = mailJobs.scheduleDigest(config.mail.digestTime, firstSweep);
  return () => {
    stopWatch();
    stopDigest();
    stopWorker();
    mail.transport.close();
    void mail.catcher?.close();
  };
}

/** Set by the primary on the one worker that schedules the watch. */
const WATCH_ENV = 'TACKLOG_RUNS_WATCH';

/** One process that serves HTTP, and schedules the watch when it is the only one or was chosen to. */
async function serve(withWatch: boolean) {
  keepRunningThroughDatabaseOutages();
  const server = await startServer({ serveClient: process.env.TACKLOG_SERVE_CLIENT !== '0' });
  const { closeDb } = await import('./db/client');
  const { stopSessionCache } = await import('./services/auth/session-cache');
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.port;
  if (!cluster.isWorker) logger.info(`Tacklog listening on http://${config.host}:${port}`);
  const stopWatch = withWatch ? await startWatch() : () => undefined;
  const stop = (signal: string) => {
    if (!cluster.isWorker) logger.info(`${signal}: stopping`);
    stopWatch();
    server.close(() => {
      Promise.all([closeDb(), stopSessionCache()]).finally(() => process.exit(0));
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

/**
 * N > 1: this process (the primary) forks N workers that share the port (node:cluster hands out
 * connections) and one of them schedules the compliance watch; a worker that dies is replaced
 * (the watch goes to its replacement); SIGTERM or SIGINT stops the workers, then the primary.
 * The workers keep no state between requests.
 */
function supervise(n: number) {
  let stopping = false;
  const watchOf = new Map<Worker, boolean>();
  const fork = (watch: boolean) => watchOf.set(cluster.fork(watch ? { [WATCH_ENV]: '1' } : {}), watch);
  for (let i = 0; i < n; i++) fork(i === 0);
  cluster.on('exit', (worker, code, signal) => {
    const hadWatch = watchOf.get(worker) ?? false;
    watchOf.delete(worker);
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    logger.error({ workerPid: worker.process.pid, code, signal }, 'a server worker stopped; starting another');
    fork(hadWatch);
  });
  let up = 0;
  cluster.on('listening', () => {
    up += 1;
    if (up === n) logger.info(`Tacklog listening on http://${config.host}:${config.port} (${n} workers)`);
  });
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info(`${signal}: stopping ${n} workers`);
    const workers = Object.values(cluster.workers ?? {});
    if (workers.length === 0) process.exit(0);
    for (const w of workers) w?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), 8000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

async function main() {
  if (cluster.isWorker) return serve(process.env[WATCH_ENV] === '1');
  const n = workerCount();
  if (n === 1) return serve(true);
  supervise(n);
}

const entry = process.argv[1] ?? '';
const isMain = import.meta.url === `file://${entry}` || entry.endsWith('server/index.ts') || entry.endsWith('server/index.js');
if (isMain) {
  main().catch((err) => {
    logger.fatal({ err }, 'failed to start');
    process.exit(1);
  });
}
