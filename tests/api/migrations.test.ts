/**
 * The committed migrations (drizzle/) build the whole data model on an EMPTY database, and
 * running them again changes nothing. Checked against PostgreSQL's own catalogue
 * (information_schema and pg_enum, PostgreSQL 15 documentation chapters 37 and 53).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { getTableName, is } from 'drizzle-orm';
import { PgTable, getTableConfig, isPgEnum } from 'drizzle-orm/pg-core';
import * as schema from '../../server/db/schema';
import { migrationsFolder, runMigrations } from '../../server/db/migrate';
import { createScratchDatabase, type ScratchDatabase } from '../helpers/db';

const exported: unknown[] = Object.values(schema);
const tables = exported.filter((v): v is PgTable => is(v, PgTable));
const enums = exported.filter(isPgEnum);
const journal = JSON.parse(fs.readFileSync(path.join(migrationsFolder, 'meta', '_journal.json'), 'utf8')) as { entries: { tag: string }[] };

let scratch: ScratchDatabase;
let client: pg.Client;

async function rows<T>(text: string, values: unknown[] = []): Promise<T[]> {
  return (await client.query(text, values)).rows as T[];
}

async function appliedMigrations(): Promise<number> {
  const [{ n }] = await rows<{ n: number }>('SELECT count(*)::int AS n FROM drizzle.__drizzle_migrations');
  return n;
}

describe('migrations on an empty database', () => {
  beforeAll(async () => {
    scratch = await createScratchDatabase('migr');
    client = new pg.Client({ connectionString: scratch.url });
    await client.connect();
  });

  afterAll(async () => {
    await client?.end();
    await scratch?.drop();
  });

  it('starts with no tables at all', async () => {
    const found = await rows("SELECT table_name FROM information_schema.tables WHERE table_schema = 'public'");
    expect(found).toEqual([]);
  });

  it('applies every committed migration', async () => {
    expect(tables.length).toBeGreaterThan(5);
    await runMigrations(scratch.url);
    expect(await appliedMigrations()).toBe(journal.entries.length);
  });

  it('creates every table the schema declares, with every declared column', async () => {
    for (const table of tables) {
      const name = getTableName(table);
      const columns = await rows<{ column_name: string }>(
        "SELECT column_name FROM information_schema.columns WHERE table_schema = 'public' AND table_name = $1",
        [name],
      );
      expect(columns.length, `table ${name}`).toBeGreaterThan(0);
      const declared = getTableConfig(table)
        .columns.map((c) => c.name)
        .sort();
      expect(columns.map((c) => c.column_name).sort(), `columns of ${name}`).toEqual(declared);
    }
  });

  it('creates every enum with its values in order (shared/constants.ts)', async () => {
    expect(enums.length).toBeGreaterThan(0);
    for (const e of enums) {
      const labels = await rows<{ enumlabel: string }>(
        'SELECT e.enumlabel FROM pg_enum e JOIN pg_type t ON t.oid = e.enumtypid WHERE t.typname = $1 ORDER BY e.enumsortorder',
        [e.enumName],
      );
      expect(
        labels.map((l) => l.enumlabel),
        `enum ${e.enumName}`,
      ).toEqual([...e.enumValues]);
    }
  });

  it('running them again is a no-op that keeps the data', async () => {
    await client.query("INSERT INTO users (email, name, password_hash) VALUES ('keep@tacklog.test', 'Keep Me', 'x')");
    const before = await rows<{ table_name: string }>(
      "SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY 1",
    );
    await runMigrations(scratch.url);
    expect(await appliedMigrations()).toBe(journal.entries.length);
    const after = await rows<{ table_name: string }>(
      "SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY 1",
    );
    expect(after).toEqual(before);
    const kept = await rows<{ email: string }>('SELECT email FROM users');
    expect(kept).toEqual([{ email: 'keep@tacklog.test' }]);
  });
});
