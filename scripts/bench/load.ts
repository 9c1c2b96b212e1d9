/**
 * Closed-loop load over keep-alive HTTP: `clients` callers, each sending its next request as soon
 * as the last one answered, for a fixed time after a warm-up. Counts completed operations (an
 * operation may be several requests, e.g. a scan's resolve + load) and their latencies.
 */
import http from 'node:http';
import { performance } from 'node:perf_hooks';
import { percentile } from './measure';

export interface HttpReply {
  status: number;
  body: string;
}

/** A small keep-alive JSON client (node:http; one socket per concurrent caller). */
export function httpClient(base: string, maxSockets: number) {
  const url = new URL(base);
  const agent = new http.Agent({ keepAlive: true, maxSockets });
  return {
    request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<HttpReply> {
      const payload = body === undefined ? undefined : JSON.stringify(body);
      return new Promise((resolve, reject) => {
        const req = http.request(
          {
            agent,
            host: url.hostname,
            port: url.port,
            method,
            path,
            headers: {
              ...headers,
              ...(payload ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(payload) } : {}),
            },
          },
          (res) => {
            const chunks: Buffer[] = [];
            res.on('data', (c: Buffer) => chunks.push(c));
            res.on('end', () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
            res.on('error', reject);
          },
        );
        req.on('error', reject);
        if (payload) req.write(payload);
        req.end();
      });
    },
    close: () => agent.destroy(),
  };
}

export interface LoadResult {
  ops: number;
  perSec: number;
  p50: number;
  p99: number;
  errors: number;
  firstError?: string;
}

/**
 * Runs `op` from `clients` callers for `warmupMs` (not counted), then `durationMs` (counted).
 * `op` throws on a wrong answer; errors are counted and the first is kept.
 */
export async function closedLoop(
  clients: number,
  warmupMs: number,
  durationMs: number,
  op: (caller: number) => Promise<void>,
): Promise<LoadResult> {
  const latencies: number[] = [];
  let errors = 0;
  let firstError: string | undefined;
  const t0 = performance.now();
  const measureFrom = t0 + warmupMs;
  const until = measureFrom + durationMs;
  const caller = async (n: number) => {
    for (;;) {
      const start = performance.now();
      if (start >= until) return;
      try {
        await op(n);
      } catch (err) {
        errors += 1;
        firstError ??= (err as Error).message;
        if (errors > 100) throw new Error(`too many failed requests; the first: ${firstError}`);
      }
      const end = performance.now();
      if (start >= measureFrom && end <= until) latencies.push(end - start);
    }
  };
  await Promise.all(Array.from({ length: clients }, (_, i) => caller(i)));
  latencies.sort((a, b) => a - b);
  return {
    ops: latencies.length,
    perSec: latencies.length / (durationMs / 1000),
    p50: percentile(latencies, 50),
    p99: percentile(latencies, 99),
    errors,
    firstError,
  };
}
