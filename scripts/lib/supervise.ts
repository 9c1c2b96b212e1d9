/**
 * Keeps the server running for `npm start`: when it exits without being asked to (a crash, an
 * out-of-memory kill, `kill -9`), it is started again after a pause that doubles with each quick
 * failure (1 s, 2 s, 4 s … at most 30 s) and returns to 1 s once a run has lasted a minute. The
 * database cluster belongs to the start script, not to the server, so it keeps running
 * meanwhile. Only the script's own shutdown (Ctrl-C, SIGTERM) stops the server for good.
 */
import type { ChildProcess } from 'node:child_process';
import os from 'node:os';
import { isShuttingDown, log, onShutdown, stopChild, waitForExit } from './proc';

export interface SuperviseOptions {
  /** Starts one server process. */
  start: () => ChildProcess;
  /** Resolves once the process serves requests; rejects if it exits first or never does. */
  ready: (child: ChildProcess) => Promise<void>;
  /** Called once, after the first start is ready (e.g. print where the app is). */
  onFirstReady?: () => void | Promise<void>;
  minDelayMs?: number;
  maxDelayMs?: number;
  /** A run at least this long counts as healthy: the next pause starts again at minDelayMs. */
  stableMs?: number;
}

function describeExit(code: number): string {
  if (code > 128) {
    const name = Object.entries(os.constants.signals).find(([, n]) => n === code - 128)?.[0];
    if (name) return `killed by ${name}`;
  }
  return `exit ${code}`;
}

/**
 * Runs the server under supervision until the script shuts down. The first start failing is
 * an error for the person at the terminal (wrong configuration, port taken …); later failures
 * are retried with back-off.
 */
export async function supervise(options: SuperviseOptions): Promise<number> {
  const { minDelayMs = 1000, maxDelayMs = 30_000, stableMs = 60_000 } = options;
  let current: ChildProcess | null = null;
  let wake: (() => void) | null = null;
  onShutdown(async () => {
    wake?.();
    if (current) await stopChild(current);
  });

  let delay = minDelayMs;
  let firstReady = false;
  for (let run = 1; ; run++) {
    if (isShuttingDown()) return 0;
    const child = options.start();
    current = child;
    const startedAt = Date.now();
    log(`server started (pid ${child.pid})${run > 1 ? `, restart ${run - 1}` : ''}`);
    try {
      await options.ready(child);
      if (run > 1) log(`server is answering again (pid ${child.pid})`);
      if (!firstReady) {
        firstReady = true;
        await options.onFirstReady?.();
      }
    } catch (err) {
      if (!firstReady) {
        await stopChild(child);
        throw err;
      }
      log(`the restarted server did not come up: ${(err as Error).message}`);
      await stopChild(child);
    }
    const code = await waitForExit(child);
    if (isShuttingDown()) return code;
    if (Date.now() - startedAt >= stableMs) delay = minDelayMs;
    log(`the server stopped unexpectedly (${describeExit(code)}); starting it again in ${delay / 1000} s (PostgreSQL keeps running)`);
    await new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, delay);
      wake = () => {
        clearTimeout(timer);
        resolve();
      };
    });
    wake = null;
    delay = Math.min(delay * 2, maxDelayMs);
  }
}
