/** Latency sampling and the results table of the trace benchmark. */
import { performance } from 'node:perf_hooks';

export interface Series {
  label: string;
  samples: number[];
}

export function percentile(sorted: number[], p: number): number {
  // Nearest-rank percentile.
  if (sorted.length === 0) return NaN;
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length, Math.max(1, rank)) - 1];
}

export function summary(samples: number[]): { p50: number; p95: number; max: number } {
  const sorted = [...samples].sort((a, b) => a - b);
  return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted[sorted.length - 1] };
}

/** Runs `fn` for each input one after the other and returns the wall times in ms. */
export async function timeEach<T>(inputs: T[], fn: (input: T) => Promise<unknown>): Promise<number[]> {
  const out: number[] = [];
  for (const input of inputs) {
    const t = performance.now();
    await fn(input);
    out.push(performance.now() - t);
  }
  return out;
}

export interface Check {
  what: string;
  value: number;
  limit: number;
  unit: string;
}

const ms = (v: number) => `${v.toFixed(1)} ms`;

export function printTable(rows: { label: string; n: number; api: number[]; sql: number[] }[], checks: Check[]): boolean {
  const lines: string[][] = [['trace', 'n', 'API p50', 'API p95', 'SQL p50', 'SQL p95', 'API/SQL p50', 'API/SQL p95']];
  for (const r of rows) {
    const a = summary(r.api);
    const s = summary(r.sql);
    lines.push([
      r.label,
      String(r.n),
      ms(a.p50),
      ms(a.p95),
      ms(s.p50),
      ms(s.p95),
      `${(a.p50 / s.p50).toFixed(2)}×`,
      `${(a.p95 / s.p95).toFixed(2)}×`,
    ]);
  }
  const widths = lines[0].map((_, c) => Math.max(...lines.map((l) => l[c].length)));
  const fmt = (l: string[]) => `  ${l.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ')}`;
  console.log(fmt(lines[0]));
  console.log(`  ${widths.map((w) => '-'.repeat(w)).join('  ')}`);
  for (const l of lines.slice(1)) console.log(fmt(l));
  console.log('');
  let allMet = true;
  for (const c of checks) {
    const met = c.value < c.limit;
    allMet &&= met;
    const v = c.unit === 'ms' ? ms(c.value) : `${c.value.toFixed(2)}${c.unit}`;
    const lim = c.unit === 'ms' ? ms(c.limit) : `${c.limit}${c.unit}`;
    console.log(`  ${met ? 'MET   ' : 'MISSED'}  ${c.what}: ${v} (target < ${lim})`);
  }
  return allMet;
}
