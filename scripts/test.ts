/**
 * `npm test [-- vitest args]`: a throwaway PostgreSQL cluster (or throwaway databases on
 * DATABASE_URL's server) with two databases: one migrated for unit and API tests (DATABASE_URL)
 * and one migrated and seeded with the demo plant for browser tests (TACKLOG_E2E_DATABASE_URL).
 * Browser tests also get Debian's chromium and a fresh client build. Then `vitest run` with all
 * projects, and a closing line `tests: N passed, M failed[, K skipped]` from its JSON report.
 * The cluster and its folder are removed however the run ends.
 */
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { dropDatabase, ensureDatabase, providePostgres } from './pg';
import { ensureChromium } from './lib/apt';
import { buildClientIfStale, clientSourcesPresent, prepareDatabase } from './lib/app';
import { isShuttingDown, log, onShutdown, root, runMain, stopChild, UserFacingError, waitForExit } from './lib/proc';
import { summarise } from './lib/summary';

/** vitest options that take a value as the next argument (so that value is not a file filter). */
const VALUE_OPTIONS = new Set([
  '--project',
  '--reporter',
  '-t',
  '--testNamePattern',
  '--outputFile',
  '--config',
  '-c',
  '--root',
  '-r',
  '--dir',
  '--shard',
  '--bail',
  '--retry',
  '--maxWorkers',
  '--pool',
  '--environment',
  '--mode',
  '--testTimeout',
  '--exclude',
]);

/** Whether the e2e project will run: it has test files and the arguments do not leave it out. */
function browserTestsSelected(args: string[]): boolean {
  const e2eDir = path.join(root, 'tests', 'e2e');
  const hasFiles = fs.existsSync(e2eDir) && fs.readdirSync(e2eDir, { recursive: true }).some((f) => String(f).endsWith('.test.ts'));
  if (!hasFiles) return false;
  const projects: string[] = [];
  const filters: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--project') projects.push(args[++i] ?? '');
    else if (a.startsWith('--project=')) projects.push(a.slice('--project='.length));
    else if (VALUE_OPTIONS.has(a)) i++;
    else if (!a.startsWith('-')) filters.push(a);
  }
  if (projects.length > 0 && !projects.some((p) => p === 'e2e' || p.includes('*'))) return false;
  if (filters.length > 0 && !filters.some((f) => f.includes('e2e'))) return false;
  return true;
}

runMain(async () => {
  const args = process.argv.slice(2);
  const started = Date.now();
  const browser = browserTestsSelected(args);
  if (browser) {
    if (!clientSourcesPresent()) throw new UserFacingError('Browser tests need the client, but index.html is missing.');
    await ensureChromium('Browser tests');
  }

  const tmpDir = path.join(root, '.tmp');
  fs.mkdirSync(tmpDir, { recursive: true });
  const runId = crypto.randomBytes(4).toString('hex');
  const sharedServer = Boolean(process.env.DATABASE_URL);
  const server = await providePostgres('throwaway');
  let apiDb = 'tacklog_test';
  let e2eDb = 'tacklog_test_e2e';
  if (sharedServer) {
    // A shared server: databases of our own, dropped afterwards.
    apiDb = `tacklog_test_${runId}`;
    e2eDb = `tacklog_test_${runId}_e2e`;
    onShutdown(async () => {
      await dropDatabase(server, apiDb);
      await dropDatabase(server, e2eDb);
      log(`dropped the test databases ${apiDb} and ${e2eDb}`);
    });
  }
  const apiUrl = await ensureDatabase(server, apiDb);
  const e2eUrl = await ensureDatabase(server, e2eDb);

  await Promise.all([
    (async () => {
      await prepareDatabase(apiUrl, { seed: false });
      await prepareDatabase(e2eUrl, { seed: browser });
    })(),
    browser ? buildClientIfStale() : Promise.resolve(),
  ]);

  const reportFile = path.join(tmpDir, `vitest-${runId}.json`);
  const uploadDir = path.join(tmpDir, `uploads-${runId}`);
  onShutdown(() => {
    fs.rmSync(reportFile, { force: true });
    fs.rmSync(uploadDir, { recursive: true, force: true });
  });
  log(
    `ready in ${((Date.now() - started) / 1000).toFixed(1)} s; running vitest${browser ? '' : ' (browser tests not selected or none yet)'}`,
  );

  const vitest = spawn(
    process.execPath,
    [
      path.join(root, 'node_modules', '.bin', 'vitest'),
      'run',
      '--reporter=default',
      '--reporter=json',
      `--outputFile.json=${reportFile}`,
      ...args,
    ],
    {
      cwd: root,
      stdio: 'inherit',
      env: {
        ...process.env,
        DATABASE_URL: apiUrl,
        TACKLOG_E2E_DATABASE_URL: e2eUrl,
        TACKLOG_UPLOAD_DIR: process.env.TACKLOG_UPLOAD_DIR || uploadDir,
        // Many sign-ins from one address; the rate-limit test sets its own limit.
        TACKLOG_LOGIN_RATE_LIMIT: process.env.TACKLOG_LOGIN_RATE_LIMIT || '1000',
      },
    },
  );
  onShutdown(() => stopChild(vitest));
  const exitCode = await waitForExit(vitest);
  if (isShuttingDown()) return exitCode || 1; // Ctrl-C or SIGTERM: no summary of a cut-short run.

  const summary = summarise(reportFile);
  if (summary.note) log(summary.note);
  const failing = exitCode !== 0 || summary.failed > 0 || summary.passed + summary.failed === 0;
  if (summary.passed + summary.failed === 0) log('no test ran: that counts as a failure');
  console.log(summary.line);
  return failing ? exitCode || 1 : 0;
});
