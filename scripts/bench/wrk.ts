/**
 * The benchmark's HTTP load through wrk (Debian's package): a load generator written in C, as
 * pgbench is, so that on a machine whose few cores the server, PostgreSQL and the load share,
 * the load takes as little of them as pgbench's client does — a Node client took about a quarter
 * of a core at 16 callers. One wrk thread, `clients` keep-alive connections, each sending its next
 * request when the last one is answered (closed loop, like pgbench); a warm-up run first, not
 * counted. The requests are made by scripts/bench/phases.lua.
 */
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { root } from '../lib/proc';
import { ensureDebianProgram } from '../lib/apt';
import type { LoadResult } from './load';

export const WRK = '/usr/bin/wrk';
const SCRIPT = path.join(root, 'scripts', 'bench', 'phases.lua');

/** Installs Debian's wrk when it is missing (as root; otherwise says the command). */
export function ensureWrk(): Promise<void> {
  return ensureDebianProgram('wrk', WRK, "The benchmark's load phases");
}

export type Phase = 'load' | 'lookup' | 'reading' | 'echo' | 'ceiling-load' | 'ceiling-lookup' | 'ceiling-reading';
/** The phases that use each code once, from the front of the list. */
const CONSUMING: Phase[] = ['load', 'ceiling-load'];

export interface WrkRun {
  base: string;
  phase: Phase;
  clients: number;
  seconds: number;
  /** The status every answer must have. */
  expect: number;
  /** The lanes (phases.lua): request n is sent with token n mod lanes, to that station and batch. */
  tokens?: string[];
  stationIds?: string[];
  batchIds?: string[];
  /** For load: fresh codes, each used once, in order; for lookup: codes picked at random. */
  codes?: string[];
}

interface Raw extends LoadResult {
  /** Requests made (answered or not): how many fresh codes a load phase used. */
  issued: number;
}

function runOnce(run: WrkRun, seconds: number, codesFile: string): Promise<Raw> {
  const args = [
    '-t1',
    `-c${run.clients}`,
    `-d${seconds}s`,
    '--timeout',
    '10s',
    '-s',
    SCRIPT,
    run.base,
    '--',
    run.phase,
    (run.tokens ?? ['-']).join(','),
    codesFile,
    (run.stationIds ?? ['-']).join(','),
    (run.batchIds ?? ['-']).join(','),
    crypto.randomBytes(8).toString('hex'),
    String(run.expect),
    String(crypto.randomInt(1, 2 ** 31)),
  ];
  return new Promise((resolve, reject) => {
    const child = spawn(WRK, args, { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (out += c.toString()));
    child.on('error', reject);
    child.on('exit', (code) => {
      const m = /^wrk-result (\d+) (\d+) (\d+) (\d+) (\d+) (\d+) (\d+)$/m.exec(out);
      if (code !== 0 || !m) {
        reject(new Error(`wrk ${run.phase} failed (exit ${code}):\n${out.slice(-2000)}`));
        return;
      }
      const [requests, durationUs, issued, p50Us, p99Us, bad, socketErrors] = m.slice(1).map(Number);
      const firstBad = /^wrk-first-bad (.*)$/m.exec(out)?.[1].trim();
      const errors = bad + socketErrors;
      resolve({
        ops: requests,
        perSec: requests / (durationUs / 1e6),
        p50: p50Us / 1000,
        p99: p99Us / 1000,
        errors,
        firstError: errors ? firstBad || `${socketErrors} connection errors or timeouts` : undefined,
        issued,
      });
    });
  });
}

/**
 * One measured phase: `warmupSeconds` of the same requests first (not counted), then
 * `run.seconds`. A load phase takes its codes from the front of `run.codes` and removes what it
 * used (answered or not), so the next phase gets fresh ones.
 */
export async function wrkPhase(run: WrkRun, warmupSeconds: number): Promise<LoadResult> {
  const dir = fs.mkdtempSync(path.join(root, '.tmp', 'wrk-'));
  const codesFile = path.join(dir, 'codes.txt');
  const writeCodes = () => fs.writeFileSync(codesFile, `${(run.codes ?? []).join('\n')}\n`);
  try {
    writeCodes();
    const warm = await runOnce(run, warmupSeconds, codesFile);
    if (CONSUMING.includes(run.phase)) {
      run.codes!.splice(0, warm.issued);
      writeCodes();
    }
    const measured = await runOnce(run, run.seconds, codesFile);
    if (CONSUMING.includes(run.phase)) {
      if (measured.issued > run.codes!.length) throw new Error('the benchmark ran out of fresh containers; raise the fixture size');
      run.codes!.splice(0, measured.issued);
    }
    const { issued: _issued, ...result } = measured;
    return result;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
