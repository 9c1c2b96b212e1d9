import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';

const here = path.dirname(fileURLToPath(import.meta.url));
export const migrationsFolder = path.resolve(here, '../../drizzle');

/** Applies the committed drizzle-kit migrations in drizzle/ to the database at `url`. */
export async function runMigrations(url: string): Promise<void> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    // Serialise concurrent migrators (several processes starting at once).
    await client.query('SELECT pg_advisory_lock(7226001)');
    await migrate(drizzle(client), { migrationsFolder });
  } finally {
    await client.query('SELECT pg_advisory_unlock(7226001)').catch(() => undefined);
    await client.end();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set.');
    process.exit(2);
  }
  runMigrations(url).then(
    () => console.log('[db] migrations applied'),
    (err) => {
      console.error('[db] migration failed:', err);
      process.exit(1);
    },
  );
}
