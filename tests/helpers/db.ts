/**
 * Database helpers for API tests: real PostgreSQL, real migrations.
 *
 *   await migrateTestDatabase();              // applies drizzle/ to DATABASE_URL (once per process; startApp does it)
 *   const admin = await ensureUser(['admin']);  // {id, email, password, roles, token}, idempotent
 *   const nobody = await ensureUser([]);        // signed in, but no role at all
 *   const qa = await ensureUser(['quality'], { email: 'qa-2@tacklog.test' });  // a second user
 *   const scratch = await createScratchDatabase();  // an EMPTY database on the same server
 *   ...; await scratch.drop();
 *
 * DATABASE_URL names the test database: `npm test` creates and migrates one; to run one file by
 * hand: DATABASE_URL=postgres://…/your_db npx vitest run --project api tests/api/x.test.ts
 *
 * The token comes from a fresh session row (createSession), so it is valid for an app made in the
 * same test file (startApp) and costs no sign-in (the login rate limit stays for the tests that want it).
 */
import crypto from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import pg from 'pg';
import type { Role } from '../../shared/constants';
import { db } from '../../server/db/client';
import { runMigrations } from '../../server/db/migrate';
import { users } from '../../server/db/schema';
import { createSession, hashPassword } from '../../server/services/auth';

/** Password of every user ensureUser makes (unless given another). */
export const TEST_PASSWORD = 'test-password-1';

export interface TestUser {
  id: string;
  email: string;
  name: string;
  password: string;
  roles: Role[];
  /** A bearer token for `Authorization: Bearer <token>`. */
  token: string;
}

export function testDatabaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the API tests with `npm test`, or set it to a test database.');
  return url;
}

let migrated: Promise<void> | null = null;

/** Applies the committed migrations to DATABASE_URL once per test process. */
export function migrateTestDatabase(): Promise<void> {
  migrated ??= runMigrations(testDatabaseUrl());
  return migrated;
}

const hashes = new Map<string, Promise<string>>();
function hashOnce(password: string): Promise<string> {
  let hash = hashes.get(password);
  if (!hash) {
    hash = hashPassword(password);
    hashes.set(password, hash);
  }
  return hash;
}

/**
 * A test user with exactly `roles`, created or brought up to date (roles, password, active).
 * The default e-mail follows from the roles, so `ensureUser(['admin'])` twice is one user.
 */
export async function ensureUser(roles: Role[], options: { email?: string; name?: string; password?: string } = {}): Promise<TestUser> {
  await migrateTestDatabase();
  const label = roles.length > 0 ? [...roles].sort().join('-') : 'no-role';
  const email = (options.email ?? `test-${label}@tacklog.test`).toLowerCase();
  const name = options.name ?? `Test user (${label})`;
  const password = options.password ?? TEST_PASSWORD;
  const passwordHash = await hashOnce(password);
  const values = { name, passwordHash, roles, active: true, updatedAt: new Date() };

  const findId = async () =>
    (
      await db
        .select({ id: users.id })
        .from(users)
        .where(eq(sql`lower(${users.email})`, email))
        .limit(1)
    )[0]?.id;
  let id = await findId();
  if (!id) {
    try {
      [{ id }] = await db
        .insert(users)
        .values({ email, ...values })
        .returning({ id: users.id });
    } catch (err) {
      // Another test made the same user in between: use it.
      id = await findId();
      if (!id) throw err;
    }
  }
  await db.update(users).set(values).where(eq(users.id, id));
  const { token } = await createSession(id);
  return { id, email, name, password, roles, token };
}

export interface ScratchDatabase {
  name: string;
  url: string;
  /** Drops it (disconnecting anyone still on it). */
  drop(): Promise<void>;
}

/** An empty database beside the test database (the test's DB user needs CREATEDB, as in `npm test`). */
export async function createScratchDatabase(prefix = 'scratch'): Promise<ScratchDatabase> {
  const base = testDatabaseUrl();
  const name = `${new URL(base).pathname.slice(1) || 'tacklog'}_${prefix}_${crypto.randomBytes(4).toString('hex')}`;
  const url = new URL(base);
  url.pathname = `/${name}`;
  const admin = async (statement: string) => {
    const client = new pg.Client({ connectionString: base });
    await client.connect();
    try {
      await client.query(statement);
    } finally {
      await client.end();
    }
  };
  await admin(`CREATE DATABASE "${name}"`);
  return { name, url: url.toString(), drop: () => admin(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`) };
}

/**
 * Pins the plant's baseline failure rate for one test file (the override quality can record), so
 * lot statistics judge crafted lots against a known rate whatever other files' tests left in the
 * shared database's window. Returns the undo (call it in afterAll).
 */
export async function pinBaseline(rate: number): Promise<() => Promise<void>> {
  await migrateTestDatabase();
  const value = { rate, reason: 'pinned by a test file', by: 'tests', at: new Date().toISOString() };
  await db.execute(sql`INSERT INTO settings (key, value) VALUES ('baselineOverride', ${JSON.stringify(value)}::jsonb)
    ON CONFLICT (key) DO UPDATE SET value = EXCLUDED.value`);
  return async () => {
    await db.execute(sql`DELETE FROM settings WHERE key = 'baselineOverride'`);
  };
}
