/**
 * `npm start`: PostgreSQL (the project's own cluster in .data/pg, or DATABASE_URL), migrations,
 * the demo plant on first start, the client build, then the server on 127.0.0.1:PORT, supervised:
 * a server that crashes is started again (with back-off) while the cluster keeps running.
 * Ctrl-C (or SIGTERM) stops the server and the cluster this script started.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { ensureDatabase, providePostgres } from './pg';
import { buildClientIfStale, clientSourcesPresent, jwtSecret, prepareDatabase, printWelcome } from './lib/app';
import { buildServerIfStale, serverCommand } from './lib/server-build';
import { CHILD_STDIO, log, root, runMain, UserFacingError } from './lib/proc';
import { supervise } from './lib/supervise';

runMain(async () => {
  const port = Number(process.env.PORT || 3000);
  const server = await providePostgres('persistent');
  const databaseUrl = process.env.DATABASE_URL || server.url('tacklog');
  if (!process.env.DATABASE_URL) await ensureDatabase(server, 'tacklog');
  await prepareDatabase(databaseUrl, { seed: true });

  // TACKLOG_SERVE_CLIENT=0 serves the API only (no client build).
  const serveClient = process.env.TACKLOG_SERVE_CLIENT !== '0' && clientSourcesPresent();
  if (serveClient) await buildClientIfStale();
  else
    log(
      clientSourcesPresent()
        ? 'TACKLOG_SERVE_CLIENT=0: serving the API only'
        : 'index.html is missing: there is no client to build; serving the API only',
    );

  // The server built to JS (esbuild), run by node itself: one process (with TACKLOG_WORKERS > 1,
  // the primary of its workers), which gets our SIGTERM itself.
  await buildServerIfStale();
  const [command, args] = serverCommand();
  const env = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    PORT: String(port),
    TACKLOG_JWT_SECRET: jwtSecret(),
    TACKLOG_SERVE_CLIENT: serveClient ? '1' : '0',
  };
  return supervise({
    start: () => spawn(command, args, { cwd: root, stdio: CHILD_STDIO, detached: true, env }),
    ready: (child) => waitForListening(port, child),
    onFirstReady: () => printWelcome(`http://127.0.0.1:${port}`),
  });
});

/**
 * Resolves once the server answers /api/health at all (a 503 while the database is away still
 * means it is listening); rejects if it exits first or does not answer within a minute.
 */
async function waitForListening(port: number, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null)
      throw new UserFacingError(`the server exited during start-up (${child.exitCode ?? child.signalCode})`);
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`);
      if (res.ok || res.status === 503) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new UserFacingError(`the server did not answer on port ${port} within a minute`);
}
