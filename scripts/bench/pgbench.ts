/**
 * Debian's pgbench (installed with the PostgreSQL server) on the same server as Tacklog: the
 * built-in TPC-B-like script and the select-only script, same client count, in a database of its
 * own (dropped afterwards by the caller).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

export function findPgbench(): string {
  const dirs = fs.existsSync('/usr/lib/postgresql') ? fs.readdirSync('/usr/lib/postgresql').sort((a, b) => Number(b) - Number(a)) : [];
  for (const v of dirs) {
    const p = path.join('/usr/lib/postgresql', v, 'bin', 'pgbench');
    if (fs.existsSync(p)) return p;
  }
  throw new Error("pgbench is not installed (it comes with Debian's postgresql package: apt-get install postgresql)");
}

function libpqEnv(url: string): NodeJS.ProcessEnv {
  const u = new URL(url);
  return {
    ...process.env,
    PGHOST: u.hostname,
    PGPORT: u.port || '5432',
    PGUSER: decodeURIComponent(u.username),
    PGPASSWORD: decodeURIComponent(u.password),
    PGDATABASE: decodeURIComponent(u.pathname.slice(1)),
  };
}

function runPgbench(bin: string, url: string, args: string[]): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(bin, args, { env: libpqEnv(url), stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (out += c.toString()));
    child.on('error', reject);
    child.on('exit', (code) =>
      code === 0 ? resolve(out) : reject(new Error(`pgbench ${args.join(' ')} failed (${code}):\n${out.slice(-2000)}`)),
    );
  });
}

export interface PgbenchResult {
  tps: number;
  latencyAvgMs: number | null;
}

/** Initializes pgbench's tables at `scale` (scale ≥ clients, as pgbench's manual advises for TPC-B). */
export async function pgbenchInit(bin: string, url: string, scale: number): Promise<void> {
  await runPgbench(bin, url, ['-i', '-q', '-s', String(scale)]);
}

/**
 * One pgbench run: `select` for the select-only script (-S), else TPC-B-like. Default (simple)
 * query protocol, one connection per client, two threads, no per-transaction log.
 */
export async function pgbenchRun(
  bin: string,
  url: string,
  opts: { clients: number; seconds: number; select: boolean },
): Promise<PgbenchResult> {
  const out = await runPgbench(bin, url, [
    ...(opts.select ? ['-S'] : []),
    '-n',
    '-c',
    String(opts.clients),
    '-j',
    '2',
    '-T',
    String(opts.seconds),
  ]);
  const tps =
    /tps = ([\d.]+) \((?:without initial connection time|excluding connections establishing)\)/.exec(out) ?? /tps = ([\d.]+)/.exec(out);
  if (!tps) throw new Error(`could not read pgbench's tps:\n${out}`);
  const avg = /latency average = ([\d.]+) ms/.exec(out);
  return { tps: Number(tps[1]), latencyAvgMs: avg ? Number(avg[1]) : null };
}
