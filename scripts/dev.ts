/**
 * `npm run dev`: the same provisioning as `npm start`, then the API under `tsx watch`
 * (restarts on change) and Vite's dev server with hot reload on http://127.0.0.1:5173,
 * which proxies /api to the API (vite.config.ts). Ctrl-C stops both and the cluster.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { ensureDatabase, providePostgres } from './pg';
import { jwtSecret, prepareDatabase, printWelcome } from './lib/app';
import { CHILD_STDIO, isShuttingDown, log, onShutdown, root, runMain, stopChild, waitForExit } from './lib/proc';

runMain(async () => {
  const port = Number(process.env.PORT || 3000);
  const server = await providePostgres('persistent');
  const databaseUrl = process.env.DATABASE_URL || server.url('tacklog');
  if (!process.env.DATABASE_URL) await ensureDatabase(server, 'tacklog');
  await prepareDatabase(databaseUrl, { seed: true });

  const bin = (name: string) => path.join(root, 'node_modules', '.bin', name);
  const env = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    PORT: String(port),
    TACKLOG_JWT_SECRET: jwtSecret(),
    TACKLOG_SERVE_CLIENT: '0',
    // One process under tsx watch (a restart reloads it; no cluster to restart).
    TACKLOG_WORKERS: process.env.TACKLOG_WORKERS || '1',
  };
  const children: ChildProcess[] = [
    spawn(process.execPath, [bin('tsx'), 'watch', '--clear-screen=false', 'server/index.ts'], {
      cwd: root,
      stdio: CHILD_STDIO,
      detached: true,
      env,
    }),
    spawn(process.execPath, [bin('vite')], { cwd: root, stdio: CHILD_STDIO, detached: true, env }),
  ];
  onShutdown(() => Promise.all(children.map((c) => stopChild(c))).then(() => undefined));
  await printWelcome('http://127.0.0.1:5173 (API on port ' + port + ')');
  // Either one ending (a crash, a port in use) ends the session.
  const code = await Promise.race(children.map((c) => waitForExit(c)));
  if (!isShuttingDown()) log(`a dev process stopped (exit ${code}); stopping the rest`);
  return code === 0 ? 1 : code;
});
