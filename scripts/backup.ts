/**
 * `npm run backup`: the app's database (the project's cluster, or DATABASE_URL) dumped with
 * pg_dump in its custom format into .data/backups/tacklog-YYYYMMDD-HHMMSSZ.dump (UTC time).
 * Safe while `npm start` runs: pg_dump reads one consistent snapshot. Restore it with
 * `npm run restore -- FILE`. Uploaded documents (.data/uploads) are files, not in the dump.
 */
import fs from 'node:fs';
import path from 'node:path';
import { appDatabase } from './lib/dbtools';
import { dataDir, log, root, run, runMain } from './lib/proc';

function stamp(d = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getUTCFullYear()}${p(d.getUTCMonth() + 1)}${p(d.getUTCDate())}-${p(d.getUTCHours())}${p(d.getUTCMinutes())}${p(d.getUTCSeconds())}Z`;
}

runMain(async () => {
  const db = await appDatabase();
  const dir = path.join(dataDir(), 'backups');
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  let file = path.join(dir, `${db.name}-${stamp()}.dump`);
  for (let i = 2; fs.existsSync(file); i++) file = path.join(dir, `${db.name}-${stamp()}-${i}.dump`);
  const partial = `${file}.partial`;
  log(`backing up database ${db.name} with pg_dump (custom format)`);
  try {
    await run(path.join(db.bin, 'pg_dump'), ['--format=custom', '--compress=6', `--file=${partial}`, `--dbname=${db.url}`]);
  } catch (err) {
    fs.rmSync(partial, { force: true });
    throw err;
  }
  fs.chmodSync(partial, 0o600);
  fs.renameSync(partial, file);
  const kib = Math.ceil(fs.statSync(file).size / 1024);
  log(`backup written: ${path.relative(root, file) || file} (${kib} KiB)`);
  log(`restore it with: npm run restore -- ${path.relative(root, file) || file}`);
  // A machine-readable last line for scripts.
  console.log(`backup: ${file}`);
  return 0;
});
