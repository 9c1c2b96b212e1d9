/**
 * `npm start`: PostgreSQL (the project's own cluster in .data/pg, or DATABASE_URL), migrations,
 * the demo plant on first start, the client build, then the server on 127.0.0.1:PORT.
 * Ctrl-C stops the server and the cluster this script started.
 */
import { spawn } from 'node:child_process';
import { ensureDatabase, providePostgres } from './pg';
import { buildClientIfStale, clientSourcesPresent, jwtSecret, prepareDatabase, printWelcome } from './lib/app';
import { buildServerIfStale, serverCommand } from './lib/server-build';
import { CHILD_STDIO, isShuttingDown, log, onShutdown, root, runMain, stopChild, UserFacingError, waitForExit } from './lib/proc';

runMain(async () => {
  const port = Number(process.env.PORT || 3000);
  const server = await providePostgres('persistent');
  const databaseUrl = process.env.DATABASE_URL || server.url('tacklog');
  if (!process.env.DATABASE_URL) await ensureDatabase(server, 'tacklog');
  await prepareDatabase(databaseUrl, { seed: true });

  const serveClient = clientSourcesPresent();
  if (serveClient) await buildClientIfStale();
  else log('index.html is missing: there is no client to build; serving the API only');

  // The server built to JS (esbuild), run by node itself: one process (with TACKLOG_WORKERS > 1,
  // the primary of its workers), which gets our SIGTERM itself.
  await buildServerIfStale();
  const [command, args] = serverCommand();
  const child = spawn(command, args, {
    cwd: root,
    stdio: CHILD_STDIO,
    detached: true,
    env: {
      ...process.env,
      DATABASE_URL: databaseUrl,
      PORT: String(port),
      TACKLOG_JWT_SECRET: jwtSecret(),
      TACKLOG_SERVE_CLIENT: serveClient ? '1' : '0',
    },
  });
  onShutdown(() => stopChild(child));
  await waitForListening(port, child);
  await printWelcome(`http://127.0.0.1:${port}`);
  const code = await waitForExit(child);
  if (code !== 0 && !isShuttingDown()) log(`the server stopped (exit ${code})`);
  return code;
});

/** Resolves once the server answers /api/health; rejects if it exits first. */
async function waitForListening(port: number, child: ReturnType<typeof spawn>): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null) throw new UserFacingError(`the server exited during start-up (${child.exitCode ?? child.signalCode})`);
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new UserFacingError(`the server did not answer on port ${port} within a minute`);
}
