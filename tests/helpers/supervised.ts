/**
 * `npm start` as a child process for fault tests: scripts/start.ts with its own throwaway data
 * folder (TACKLOG_DATA_DIR: a project-local cluster, the session secret), the API only
 * (TACKLOG_SERVE_CLIENT=0), on free loopback ports. DATABASE_URL is removed from its
 * environment so it provisions PostgreSQL exactly as `npm start` does on a fresh machine.
 *
 *   const app = await startSupervised(dir);          // resolves when the welcome is printed
 *   app.serverPid();                                 // pid of the server process it runs now
 *   await app.waitForLog(/server is answering again/, app.lines.length);
 *   await app.stop();                                // SIGTERM, as Ctrl-C; resolves with its exit code
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { findPgBin, freePort } from '../../scripts/pg';
import { isRoot, root } from '../../scripts/lib/proc';

export interface SupervisedApp {
  baseUrl: string;
  port: number;
  pgPort: number;
  dataDir: string;
  /** postgres:// URL of the app's database in the project-local cluster. */
  databaseUrl: string;
  child: ChildProcess;
  lines: string[];
  serverPid(): number;
  waitForLog(pattern: RegExp, fromLine?: number, timeoutMs?: number): Promise<string>;
  stop(): Promise<number>;
}

export async function startSupervised(dataDir: string, ports?: { port: number; pgPort: number }): Promise<SupervisedApp> {
  const port = ports?.port ?? (await freePort());
  const pgPort = ports?.pgPort ?? (await freePort());
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    TACKLOG_DATA_DIR: dataDir,
    PORT: String(port),
    TACKLOG_PG_PORT: String(pgPort),
    TACKLOG_SERVE_CLIENT: '0',
    TACKLOG_WATCH_CRON: 'off',
    TACKLOG_LOGIN_RATE_LIMIT: '1000',
    // The fault tests read the server's own log lines (outage start and end, restarts).
    TACKLOG_LOG_LEVEL: 'info',
  };
  delete env.DATABASE_URL;
  delete env.TACKLOG_JWT_SECRET;
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'scripts', 'start.ts')], {
    cwd: root,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const lines: string[] = [];
  const waiters = new Set<() => void>();
  let partial = '';
  const onData = (chunk: Buffer) => {
    partial += chunk.toString();
    const parts = partial.split('\n');
    partial = parts.pop() ?? '';
    lines.push(...parts);
    waiters.forEach((w) => w());
  };
  child.stdout!.on('data', onData);
  child.stderr!.on('data', onData);
  const exited = new Promise<number>((resolve) => child.on('exit', (code, signal) => resolve(code ?? (signal ? 128 : 1))));

  const waitForLog = (pattern: RegExp, fromLine = 0, timeoutMs = 180_000) =>
    new Promise<string>((resolve, reject) => {
      const check = () => {
        const hit = lines.slice(fromLine).find((l) => pattern.test(l));
        if (hit !== undefined) {
          done();
          resolve(hit);
        } else if (child.exitCode !== null || child.signalCode !== null) {
          done();
          reject(new Error(`npm start exited before printing ${pattern}:\n${lines.slice(-30).join('\n')}`));
        }
      };
      const timer = setTimeout(() => {
        done();
        reject(new Error(`npm start did not print ${pattern} within ${timeoutMs / 1000} s:\n${lines.slice(-30).join('\n')}`));
      }, timeoutMs);
      const done = () => {
        clearTimeout(timer);
        waiters.delete(check);
      };
      waiters.add(check);
      check();
    });

  const app: SupervisedApp = {
    baseUrl: `http://127.0.0.1:${port}`,
    port,
    pgPort,
    dataDir,
    databaseUrl: `postgres://tacklog@127.0.0.1:${pgPort}/tacklog`,
    child,
    lines,
    serverPid() {
      const started = lines.filter((l) => /server started \(pid \d+\)/.test(l)).pop();
      if (!started) throw new Error('npm start has not started a server yet');
      return Number(/pid (\d+)/.exec(started)![1]);
    },
    waitForLog,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      return exited;
    },
  };
  await waitForLog(/Press Ctrl-C to stop/);
  return app;
}

/** pid of the cluster's postmaster in `dataDir/pg`, or 0 when none is recorded. */
export function postmasterPid(dataDir: string): number {
  try {
    return Number(fs.readFileSync(path.join(dataDir, 'pg', 'postmaster.pid'), 'utf8').split('\n')[0]);
  } catch {
    return 0;
  }
}

export function processAlive(pid: number): boolean {
  if (!pid) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * pg_ctl on the cluster in `dataDir/pg` (as the postgres user when we are root): 'stop' (fast
 * shutdown: sessions are ended, as when the database service is stopped), or 'start' again with
 * the options it last ran with (pg_ctl restart reads them from postmaster.opts).
 */
export function pgCtl(dataDir: string, action: 'stop' | 'start'): void {
  const bin = findPgBin();
  if (!bin) throw new Error('PostgreSQL binaries not found');
  const pgDir = path.join(dataDir, 'pg');
  const args =
    action === 'stop' ? ['-D', pgDir, '-m', 'fast', '-w', 'stop'] : ['-D', pgDir, '-l', path.join(pgDir, 'server.log'), '-w', 'restart'];
  const [cmd, cmdArgs] = isRoot()
    ? ['runuser', ['-u', 'postgres', '--', path.join(bin, 'pg_ctl'), ...args]]
    : [path.join(bin, 'pg_ctl'), args];
  const result = spawnSync(cmd, cmdArgs, { encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`pg_ctl ${action} failed: ${result.stdout}${result.stderr}`);
}
