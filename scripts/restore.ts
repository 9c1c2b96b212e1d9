/**
 * `npm run restore -- FILE [--force]`: replaces the app's database (the project's cluster, or
 * DATABASE_URL's) with a backup made by `npm run backup` (pg_dump custom format).
 *
 * The backup is first restored into a new database beside it; only when that has fully worked
 * are the two swapped by renaming, so a bad file or a failed restore leaves the current data as
 * it was. The database as it was is kept under the name `<name>_before_restore_<time>` (the
 * command prints how to drop it). While other sessions use the database (a running `npm start`)
 * it stops and says so; with --force it disconnects them instead: the running server's pool
 * reconnects to the restored database by itself (a few requests meanwhile answer 503).
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { appDatabase } from './lib/dbtools';
import { log, root, run, runCapture, runMain, UserFacingError } from './lib/proc';

const USAGE = 'Usage: npm run restore -- FILE [--force]   (FILE: a .dump made by npm run backup)';

function quoteIdent(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

async function withClient<T>(url: string, fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

runMain(async () => {
  const args = process.argv.slice(2);
  const force = args.includes('--force');
  const files = args.filter((a) => a !== '--force');
  const unknown = files.filter((a) => a.startsWith('-'));
  if (unknown.length > 0) throw new UserFacingError(`unknown option ${unknown.join(' ')}\n${USAGE}`);
  if (files.length !== 1) throw new UserFacingError(USAGE);
  // npm runs scripts from the project folder; a relative FILE is read from where it was typed.
  const file = path.resolve(process.env.INIT_CWD || process.cwd(), files[0]);
  if (!fs.existsSync(file) || !fs.statSync(file).isFile()) throw new UserFacingError(`no backup file at ${file}\n${USAGE}`);

  const db = await appDatabase();
  const listed = runCapture(path.join(db.bin, 'pg_restore'), ['--list', file]);
  if (!listed.ok) throw new UserFacingError(`${file} is not a backup pg_restore can read:\n${listed.output.trim()}`);

  const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\..*$/, '').replace('T', '_').toLowerCase();
  const incoming = `${db.name}_restoring_${crypto.randomBytes(3).toString('hex')}`;
  const kept = `${db.name}_before_restore_${stamp}`;
  const incomingUrl = db.server.url(incoming);

  await withClient(db.adminUrl, async (admin) => {
    const exists = (await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [db.name])).rowCount === 1;
    if (exists && !force) {
      const others = await admin.query<{ n: string }>(
        'SELECT count(*) AS n FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()',
        [db.name],
      );
      const n = Number(others.rows[0].n);
      if (n > 0) {
        throw new UserFacingError(
          `${n} other session(s) use database ${db.name} (is npm start running?). Stop it first, or run again with --force ` +
            'to disconnect them (the running server reconnects to the restored data by itself).',
        );
      }
    }
    log(`restoring ${path.relative(root, file) || file} into a new database ${incoming}`);
    await admin.query(`CREATE DATABASE ${quoteIdent(incoming)}`);
  });

  try {
    await run(path.join(db.bin, 'pg_restore'), ['--no-owner', '--no-privileges', '--exit-on-error', `--dbname=${incomingUrl}`, file]);
  } catch (err) {
    await withClient(db.adminUrl, (admin) => admin.query(`DROP DATABASE IF EXISTS ${quoteIdent(incoming)} WITH (FORCE)`));
    log(`the restore failed; database ${db.name} is unchanged`);
    throw err;
  }

  await withClient(db.adminUrl, async (admin) => {
    const exists = (await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [db.name])).rowCount === 1;
    if (exists) {
      // No new sessions, then end the current ones, then swap by renaming.
      await admin.query(`ALTER DATABASE ${quoteIdent(db.name)} ALLOW_CONNECTIONS false`);
      try {
        const ended = await admin.query(
          'SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()',
          [db.name],
        );
        if (ended.rowCount) log(`disconnected ${ended.rowCount} session(s) from ${db.name}`);
        await admin.query(`ALTER DATABASE ${quoteIdent(db.name)} RENAME TO ${quoteIdent(kept)}`);
      } catch (err) {
        await admin.query(`ALTER DATABASE ${quoteIdent(db.name)} ALLOW_CONNECTIONS true`).catch(() => undefined);
        await admin.query(`DROP DATABASE IF EXISTS ${quoteIdent(incoming)} WITH (FORCE)`).catch(() => undefined);
        throw new UserFacingError(`could not set database ${db.name} aside (${(err as Error).message}); it is unchanged`);
      }
      await admin.query(`ALTER DATABASE ${quoteIdent(kept)} ALLOW_CONNECTIONS true`);
    }
    await admin.query(`ALTER DATABASE ${quoteIdent(incoming)} RENAME TO ${quoteIdent(db.name)}`);
    log(`database ${db.name} now holds the backup`);
    if (exists) log(`the data as it was is kept in database ${kept}; when you no longer need it: DROP DATABASE ${quoteIdent(kept)};`);
  });
  console.log(`restored: ${db.name}`);
  return 0;
});
