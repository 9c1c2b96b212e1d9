import type { Server } from 'node:http';
import { createApp } from './app';
import { config } from './config';
import { closeDb } from './db/client';
import { isDatabaseUnavailable, noteDatabaseDown } from './db/availability';
import { scheduleComplianceWatch } from './jobs/compliance';
import { scheduleDigest, startMailTransport, startOutboxWorker } from './jobs/mail';
import { sweep } from './services/compliance';

/** Starts the HTTP server (API and built client) on 127.0.0.1:PORT. */
export async function startServer(options: { serveClient?: boolean; port?: number } = {}): Promise<Server> {
  const app = createApp({ serveClient: options.serveClient ?? true });
  const port = options.port ?? config.port;
  return new Promise((resolve, reject) => {
    const server = app.listen(port, config.host, () => resolve(server));
    server.on('error', reject);
  });
}

/**
 * A database outage must not end the process: whatever escapes as an unhandled rejection or
 * exception because PostgreSQL went away is logged (once per outage) and the server keeps
 * answering 503 until it is back. Anything else leaves the process in an unknown state: it exits,
 * and `npm start`'s supervisor starts a fresh one.
 */
function keepRunningThroughDatabaseOutages(): void {
  const handle = (kind: string) => (err: unknown) => {
    if (isDatabaseUnavailable(err)) {
      noteDatabaseDown(err);
      return;
    }
    console.error(`[server] ${kind}; exiting:`, err);
    process.exit(1);
  };
  process.on('unhandledRejection', handle('unhandled rejection'));
  process.on('uncaughtException', handle('uncaught exception'));
}

async function main() {
  keepRunningThroughDatabaseOutages();
  const server = await startServer({ serveClient: process.env.TACKLOG_SERVE_CLIENT !== '0' });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.port;
  console.log(`[server] Tacklog listening on http://${config.host}:${port}`);
  const mail = await startMailTransport();
  console.log(`[mail] sending through the ${mail.transport.describe}${mail.catcher ? ' (no TACKLOG_SMTP_URL: messages stay here; read them on the Mailbox page)' : ''}`);
  const stopWorker = startOutboxWorker();
  const stopWatch = scheduleComplianceWatch(config.watchSchedule);
  let firstSweep: Promise<unknown> = Promise.resolve();
  if (config.watchSchedule !== 'off') {
    // A first sweep at start, so alerts are current before the first scheduled run.
    firstSweep = sweep().then(
      (r) => r.ran && console.log(`[watch] first sweep: raised ${r.raised}, resolved ${r.resolved}`),
      (err) => (isDatabaseUnavailable(err) ? noteDatabaseDown(err) : console.error('[watch] first sweep failed:', err)),
    );
  }
  // Today's digest, if its time has passed, waits for the first sweep so it reports current alerts.
  const stopDigest = scheduleDigest(config.mail.digestTime, firstSweep);
  const stop = (signal: string) => {
    console.log(`[server] ${signal}: stopping`);
    stopWatch();
    stopDigest();
    stopWorker();
    mail.transport.close();
    server.close(() => {
      Promise.allSettled([mail.catcher?.close(), closeDb()]).finally(() => process.exit(0));
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

const isMain = import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith('server/index.ts');
if (isMain) {
  main().catch((err) => {
    console.error('[server] failed to start:', err);
    process.exit(1);
  });
}
