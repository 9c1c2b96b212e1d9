/**
 * The server built to JavaScript for `npm start` and the benchmark: esbuild bundles server/ and
 * shared/ into .server-build/index.js (npm packages stay external, loaded from node_modules), so
 * the server starts without the runtime TypeScript loader. Chunks sit beside index.js. `npm run dev` and the tests keep tsx.
 * The output sits one folder below the root, as server/config.ts expects.
 */
import fs from 'node:fs';
import path from 'node:path';
import { log, newestMtime, root, UserFacingError } from './proc';

export const SERVER_BUILD = path.join(root, '.server-build', 'index.js');
const SOURCES = ['server', 'shared', 'package-lock.json'];

export function serverBuildStale(): boolean {
  const built = newestMtime(SERVER_BUILD);
  return built === 0 || SOURCES.some((p) => newestMtime(path.join(root, p)) > built);
}

/** Builds .server-build/index.js when it is missing or older than a server source. */
export async function buildServerIfStale(): Promise<void> {
  if (!serverBuildStale()) return;
  const { build } = await import('esbuild');
  const t = Date.now();
  fs.rmSync(path.dirname(SERVER_BUILD), { recursive: true, force: true });
  await build({
    entryPoints: [path.join(root, 'server', 'index.ts')],
    outdir: path.dirname(SERVER_BUILD),
    bundle: true,
    // Dynamic imports become chunks of their own, with their packages: the primary of several
    // workers then loads neither Express nor the database layer.
    splitting: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: true,
    logLevel: 'warning',
  });
  fs.utimesSync(SERVER_BUILD, new Date(), new Date());
  log(`built the server to ${path.relative(root, SERVER_BUILD)} in ${((Date.now() - t) / 1000).toFixed(1)} s`);
}

/**
 * The old-generation cap of each server process, in MB (TACKLOG_HEAP_MB; none by default).
 * Uncapped, a server process stays at ~130 MB under the benchmark's scan loads (requests leave
 * no garbage in the old generation since server/http-server.ts, and the compliance sweep reads
 * only its candidates); a cap makes V8 collect more often for the same work — lookups ~15 %
 * slower with 192 MB — so it is only for a machine where memory is tighter than time. A report
 * far larger than the plant's usual ones may need a higher cap.
 */
export function heapCapMb(): number | null {
  const raw = process.env.TACKLOG_HEAP_MB;
  if (raw === undefined || raw === '') return null;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 96 || n > 65536)
    throw new UserFacingError(`TACKLOG_HEAP_MB must be a whole number of megabytes from 96 to 65536, got "${raw}"`);
  return n;
}

/**
 * How to run the server: the built JS (with source maps for stack traces). A young generation of
 * 4 MB semi-spaces instead of V8's 16 MB: a request's garbage dies young either way, and each
 * process (cluster workers inherit the flags) stays ~20 MB smaller under load at no measurable
 * cost in throughput (`npm run bench`); the old generation capped only when asked (heapCapMb).
 */
export function serverCommand(): [string, string[]] {
  const cap = heapCapMb();
  return [
    process.execPath,
    ['--enable-source-maps', '--max-semi-space-size=4', ...(cap ? [`--max-old-space-size=${cap}`] : []), SERVER_BUILD],
  ];
}
