/**
 * vitest globalSetup for browser tests (runs in the main process): serves the built client and
 * the API from `tsx server/index.ts` against TACKLOG_E2E_DATABASE_URL (a migrated, demo-seeded
 * database prepared by scripts/test.ts) on a free port, and provides its URL as `baseUrl`.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const bin = (name: string) => path.join(root, 'node_modules', '.bin', name);

function newestMtime(target: string): number {
  if (!fs.existsSync(target)) return 0;
  const stat = fs.statSync(target);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) newest = Math.max(newest, newestMtime(path.join(target, entry)));
  return newest;
}

/** Builds the client when dist/ is missing or older than its sources. */
function ensureClientBuilt(): void {
  const indexHtml = path.join(root, 'dist', 'index.html');
  const sources = ['src', 'shared', 'index.html', 'vite.config.ts', 'package-lock.json'].map((p) => newestMtime(path.join(root, p)));
  if (fs.existsSync(indexHtml) && fs.statSync(indexHtml).mtimeMs >= Math.max(...sources)) return;
  console.log('[e2e] building the client (vite build)…');
  const result = spawnSync(bin('vite'), ['build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) throw new Error(`vite build failed (exit ${result.status ?? result.signal})`);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

async function waitForHealth(url: string, child: ChildProcess, logs: () => string, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null) {
      throw new Error(`The server exited (${child.exitCode ?? child.signalCode}) before it was ready:\n${logs()}`);
    }
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok) return;
    } catch {
      // Not listening yet: try again shortly.
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`The server did not answer ${url}/api/health within ${timeoutMs / 1000} s:\n${logs()}`);
}

function stopServer(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    const force = setTimeout(() => child.kill('SIGKILL'), 5000);
    child.once('exit', () => {
      clearTimeout(force);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

export default async function setup(project: TestProject) {
  const databaseUrl = process.env.TACKLOG_E2E_DATABASE_URL;
  if (!databaseUrl) {
    throw new Error('Browser tests need TACKLOG_E2E_DATABASE_URL: a migrated, demo-seeded database (npm test prepares one).');
  }
  ensureClientBuilt();

  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  let output = '';
  const child = spawn(bin('tsx'), ['server/index.ts'], {
    cwd: root,
    env: {
      ...process.env,
      DATABASE_URL: databaseUrl,
      PORT: String(port),
      HOST: '127.0.0.1',
      TACKLOG_WATCH_CRON: 'off',
      TACKLOG_SERVE_CLIENT: '1',
      // One server process in tests (TACKLOG_WORKERS defaults to one per core).
      TACKLOG_WORKERS: '1',
      // Every browser test signs in; the production limit would throttle the suite.
      TACKLOG_LOGIN_RATE_LIMIT: '1000',
      // A plant zone other than this machine's (UTC) and the browsers', so a page that formats a
      // time in the browser's zone shows a wrong hour and fails (tests/e2e/plant-time.test.ts).
      TACKLOG_PLANT_ZONE: 'Europe/Berlin',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const collect = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-20_000);
  };
  child.stdout?.on('data', collect);
  child.stderr?.on('data', collect);

  try {
    await waitForHealth(url, child, () => output);
  } catch (err) {
    await stopServer(child);
    throw err;
  }
  project.provide('baseUrl', url);

  return async () => {
    await stopServer(child);
  };
}
