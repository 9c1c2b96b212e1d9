import type { Server } from 'node:http';
import { createApp } from './app';
import { config } from './config';
import { closeDb } from './db/client';
import { scheduleComplianceWatch } from './jobs/compliance';
import { sweep } from './services/compliance';
import { logger } from './logger';

/** Starts the HTTP server (API and built client) on 127.0.0.1:PORT. */
export async function startServer(options: { serveClient?: boolean; port?: number } = {}): Promise<Server> {
  const app = createApp({ serveClient: options.serveClient ?? true });
  const port = options.port ?? config.port;
  return new Promise((resolve, reject) => {
    const server = app.listen(port, config.host, () => resolve(server));
    server.on('error', reject);
  });
}

async function main() {
  const server = await startServer({ serveClient: process.env.TACKLOG_SERVE_CLIENT !== '0' });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.port;
  logger.info(`Tacklog listening on http://${config.host}:${port}`);
  const stopWatch = scheduleComplianceWatch(config.watchSchedule);
  if (config.watchSchedule !== 'off') {
    // A first sweep at start, so alerts are current before the first scheduled run.
    sweep().then(
      (r) => r.ran && logger.info({ job: 'watch', ...r }, `first sweep: raised ${r.raised}, resolved ${r.resolved}`),
      (err) => logger.error({ job: 'watch', err }, 'first sweep failed'),
    );
  }
  const stop = (signal: string) => {
    logger.info(`${signal}: stopping`);
    stopWatch();
    server.close(() => {
      closeDb().finally(() => process.exit(0));
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

const isMain = import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith('server/index.ts');
if (isMain) {
  main().catch((err) => {
    logger.fatal({ err }, 'failed to start');
    process.exit(1);
  });
}
