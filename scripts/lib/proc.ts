/**
 * Process helpers shared by the start, dev and test scripts: logging, running commands,
 * and one orderly shutdown path (Ctrl-C, SIGTERM, errors) that runs registered clean-ups.
 */
import { spawn, spawnSync, type ChildProcess, type SpawnOptions } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/**
 * The folder `npm start` keeps its data in: the cluster (pg/), the session secret, uploads and
 * backups. TACKLOG_DATA_DIR moves it (tests use a throwaway one); default `.data` in the checkout.
 */
export function dataDir(): string {
  const dir = process.env.TACKLOG_DATA_DIR;
  return dir ? path.resolve(root, dir) : path.join(root, '.data');
}

export function log(message: string): void {
  console.log(`[tacklog] ${message}`);
}

/** An error whose message tells the person what to do; printed without a stack trace. */
export class UserFacingError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UserFacingError';
  }
}

export function isRoot(): boolean {
  return typeof process.getuid === 'function' && process.getuid() === 0;
}

/** Runs a command to completion with inherited output; rejects on a non-zero exit. */
export function run(cmd: string, args: string[], options: SpawnOptions = {}): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: root, stdio: 'inherit', ...options });
    child.on('error', reject);
    child.on('exit', (code, signal) => {
      if (code === 0) resolve();
      else
        reject(new UserFacingError(`${path.basename(cmd)} ${args.join(' ')} failed (${signal ?? `exit ${code}`}); its output is above.`));
    });
  });
}

/** Runs a command synchronously and captures its output (never throws for a non-zero exit). */
export function runCapture(cmd: string, args: string[]): { ok: boolean; output: string } {
  const result = spawnSync(cmd, args, { cwd: root, encoding: 'utf8' });
  const output = `${result.stdout ?? ''}${result.stderr ?? ''}${result.error ? result.error.message : ''}`;
  return { ok: result.status === 0, output };
}

/**
 * For long-running children started `detached` (their own process group): a terminal's Ctrl-C
 * reaches only the script, which stops them once and in order. No stdin: a background process
 * group reading the terminal would be stopped.
 */
export const CHILD_STDIO: SpawnOptions['stdio'] = ['ignore', 'inherit', 'inherit'];

/** Resolves with the exit code of a child (128 + signal number when a signal ended it). */
export function waitForExit(child: ChildProcess): Promise<number> {
  if (child.exitCode !== null) return Promise.resolve(child.exitCode);
  if (child.signalCode !== null) return Promise.resolve(128 + (os.constants.signals[child.signalCode] ?? 1));
  return new Promise((resolve) => {
    child.on('exit', (code, signal) => resolve(signal ? 128 + (os.constants.signals[signal] ?? 1) : (code ?? 1)));
  });
}

/**
 * Asks a child to stop (SIGTERM), waits, and kills it after `graceMs` — with its whole process
 * group when it was started `detached`, so no grandchild is left behind.
 */
export async function stopChild(child: ChildProcess, graceMs = 8000): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const done = waitForExit(child);
  child.kill('SIGTERM');
  const timer = setTimeout(() => {
    try {
      if (child.pid) process.kill(-child.pid, 'SIGKILL');
    } catch {
      child.kill('SIGKILL');
    }
  }, graceMs);
  await done;
  clearTimeout(timer);
}

type Cleanup = () => void | Promise<void>;
const cleanups: Cleanup[] = [];
const exitCleanups: (() => void)[] = [];
let shuttingDown: Promise<never> | null = null;

/** Registers an async clean-up for the orderly shutdown (run in reverse order of registration). */
export function onShutdown(fn: Cleanup): void {
  cleanups.push(fn);
}

/**
 * Registers a synchronous last-resort clean-up that also runs from process 'exit'
 * (e.g. stopping the database cluster after an unexpected crash). It must be idempotent.
 */
export function onExit(fn: () => void): void {
  exitCleanups.push(fn);
}

function runExitCleanups(): void {
  while (exitCleanups.length > 0) {
    const fn = exitCleanups.pop()!;
    try {
      fn();
    } catch (err) {
      console.error('[tacklog] clean-up failed:', (err as Error).message);
    }
  }
}

export function isShuttingDown(): boolean {
  return shuttingDown !== null;
}

/** Runs every clean-up once, then exits with `code`. Further calls wait for the first. */
export function shutdown(code: number): Promise<never> {
  if (shuttingDown) return shuttingDown;
  shuttingDown = (async () => {
    while (cleanups.length > 0) {
      const fn = cleanups.pop()!;
      try {
        await fn();
      } catch (err) {
        console.error('[tacklog] clean-up failed:', (err as Error).message);
      }
    }
    runExitCleanups();
    process.exit(code);
  })();
  return shuttingDown;
}

let installed = false;

/** Ctrl-C, SIGTERM, SIGHUP and crashes all go through `shutdown`. */
export function installShutdownHandlers(): void {
  if (installed) return;
  installed = true;
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(signal, () => {
      if (!shuttingDown) log(`${signal}: stopping`);
      void shutdown(128 + os.constants.signals[signal]);
    });
  }
  process.on('uncaughtException', (err) => {
    console.error('[tacklog] unexpected error:', err);
    void shutdown(1);
  });
  process.on('unhandledRejection', (err) => {
    console.error('[tacklog] unexpected error:', err);
    void shutdown(1);
  });
  process.on('exit', runExitCleanups);
}

/** Runs a script's main function with the shutdown handlers; errors end in an orderly exit. */
export function runMain(main: () => Promise<number | void>): void {
  installShutdownHandlers();
  main().then(
    (code) => {
      if (typeof code === 'number') void shutdown(code);
    },
    (err: unknown) => {
      if (err instanceof UserFacingError) console.error(`[tacklog] ${err.message}`);
      else console.error('[tacklog] failed:', err);
      void shutdown(1);
    },
  );
}

/** Newest modification time of the files under `target` (a file or a folder), skipping dot-folders. */
export function newestMtime(target: string): number {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(target);
  } catch {
    return 0;
  }
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target, { withFileTypes: true })) {
    if (entry.name.startsWith('.') || entry.name === 'node_modules') continue;
    newest = Math.max(newest, newestMtime(path.join(target, entry.name)));
  }
  return newest;
}
