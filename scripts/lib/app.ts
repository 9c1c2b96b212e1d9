/**
 * Steps shared by the start, dev and test scripts once PostgreSQL is there:
 * migrate (and seed) a database, keep the session-signing secret, build the client.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { dataDir, log, newestMtime, root, run } from './proc';

/**
 * Applies the migrations to `url` and, with `seed`, loads the demo plant into it (only when it
 * is empty: seedDemo's contract). The server modules read DATABASE_URL when first imported, so
 * this sets it first; call it at most once with `seed` per process.
 */
export async function prepareDatabase(url: string, options: { seed: boolean }): Promise<void> {
  const { runMigrations } = await import('../../server/db/migrate');
  await runMigrations(url);
  log('migrations applied');
  if (!options.seed) return;
  process.env.DATABASE_URL = url;
  const { seedDemo } = await import('../../server/db/seed/index');
  const { closeDb } = await import('../../server/db/client');
  try {
    const { seeded } = await seedDemo();
    log(seeded ? 'demo plant seeded' : 'database already has data: not seeding');
  } finally {
    await closeDb();
  }
}

/** The session-signing secret: TACKLOG_JWT_SECRET, else one kept in .data/jwt-secret (made once, mode 0600). */
export function jwtSecret(): string {
  if (process.env.TACKLOG_JWT_SECRET) return process.env.TACKLOG_JWT_SECRET;
  const file = path.join(dataDir(), 'jwt-secret');
  try {
    const existing = fs.readFileSync(file, 'utf8').trim();
    if (existing.length >= 32) return existing;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
  }
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const secret = crypto.randomBytes(48).toString('hex');
  fs.writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  fs.chmodSync(file, 0o600);
  log(`made a new session secret in ${path.relative(root, file) || file}`);
  return secret;
}

const CLIENT_SOURCES = ['src', 'shared', 'index.html', 'vite.config.ts', 'package-lock.json'];

/** Whether the client sources exist at all (index.html is the entry). */
export function clientSourcesPresent(): boolean {
  return fs.existsSync(path.join(root, 'index.html'));
}

/** dist/ is missing or older than any client source. */
export function clientBuildStale(): boolean {
  const built = newestMtime(path.join(root, 'dist', 'index.html'));
  if (built === 0) return true;
  return CLIENT_SOURCES.some((p) => newestMtime(path.join(root, p)) > built);
}

/** Builds the client with vite when dist/ is stale. */
export async function buildClientIfStale(): Promise<void> {
  if (!clientBuildStale()) {
    log('client build is up to date');
    return;
  }
  log('building the client (vite build)');
  await run(path.join(root, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn']);
}

/** Prints where the app is and how to sign in. */
export async function printWelcome(url: string): Promise<void> {
  const { DEMO_ACCOUNTS } = await import('../../server/db/seed/users');
  const password = process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo';
  const lines = [
    '',
    `  Tacklog is running at ${url}`,
    '',
    `  Demo accounts (password: ${password}):`,
    ...DEMO_ACCOUNTS.map((a) => `    ${a.email.padEnd(28)} ${a.roles.join(', ')}`),
    '',
    '  Press Ctrl-C to stop.',
    '',
  ];
  console.log(lines.join('\n'));
}
