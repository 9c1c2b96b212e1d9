/**
 * `npm run backup` and `npm run restore -- FILE` round-trip the demo database of a real
 * `npm start` (its own cluster in a throwaway TACKLOG_DATA_DIR): a driver's backward trace and a
 * lot's forward trace read through the API are the same after the restore as before the backup,
 * and differ in between (so the comparison can fail).
 */
import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { root } from '../../scripts/lib/proc';
import { startSupervised, type SupervisedApp } from '../helpers/supervised';

const dataDir = path.join(root, '.tmp', `backup-${crypto.randomBytes(4).toString('hex')}`);
let app: SupervisedApp;
let token: string;

/** `npm run <command> -- args` (through scripts/bootstrap.mjs, as npm does) with the app's data folder. */
function npmRun(command: 'backup' | 'restore', args: string[] = []): Promise<{ code: number; output: string }> {
  return new Promise((resolve) => {
    const env: NodeJS.ProcessEnv = { ...process.env, TACKLOG_DATA_DIR: dataDir, TACKLOG_PG_PORT: String(app.pgPort) };
    delete env.DATABASE_URL;
    delete env.INIT_CWD;
    const child = spawn(process.execPath, [path.join(root, 'scripts', 'bootstrap.mjs'), command, ...args], {
      cwd: root,
      env,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.on('data', (d: Buffer) => (output += d.toString()));
    child.stderr.on('data', (d: Buffer) => (output += d.toString()));
    const timer = setTimeout(() => child.kill('SIGTERM'), 180_000);
    child.on('exit', (code) => {
      clearTimeout(timer);
      resolve({ code: code ?? 1, output });
    });
  });
}

async function get<T>(p: string): Promise<{ status: number; body: T }> {
  const res = await fetch(`${app.baseUrl}${p}`, { headers: { authorization: `Bearer ${token}` } });
  return { status: res.status, body: (await res.json()) as T };
}

/** GET with retries while the server reconnects after the restore swapped the database. */
async function getAfterSwap<T>(p: string): Promise<T> {
  const deadline = Date.now() + 60_000;
  for (;;) {
    const res = await get<T>(p);
    if (res.status === 200) return res.body;
    if (res.status !== 503 || Date.now() > deadline) throw new Error(`${p} answered ${res.status}: ${JSON.stringify(res.body)}`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

async function sql<T extends pg.QueryResultRow>(text: string, params: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: app.databaseUrl });
  await client.connect();
  try {
    return (await client.query<T>(text, params)).rows;
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  app = await startSupervised(dataDir);
  const res = await fetch(`${app.baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'quality@tacklog.test', password: process.env.TACKLOG_DEMO_PASSWORD || 'tacklog-demo' }),
  });
  token = ((await res.json()) as { token: string }).token;
});

afterAll(async () => {
  await app?.stop();
  fs.rmSync(dataDir, { recursive: true, force: true });
  fs.rmSync(`${dataDir}.owner`, { force: true });
});

describe('backup and restore of the demo database', () => {
  it('round-trips a driver trace and a lot trace', async () => {
    // A demo lot that reached drivers, and one of those drivers.
    const lots = await sql<{ id: string }>('SELECT id FROM lots ORDER BY received_at');
    let lotId = '';
    let serial = '';
    for (const { id } of lots) {
      const trace = await get<{ drivers: { serial: string }[] }>(`/api/lots/${id}/trace`);
      if (trace.status === 200 && trace.body.drivers.length > 0) {
        lotId = id;
        serial = trace.body.drivers[0].serial;
        break;
      }
    }
    expect(serial, 'the demo plant has a lot that reached drivers').not.toBe('');
    const lotBefore = await get(`/api/lots/${lotId}/trace`);
    const driverBefore = await get<{ steps: unknown[] }>(`/api/drivers/${encodeURIComponent(serial)}/trace`);
    expect(driverBefore.status).toBe(200);
    expect(driverBefore.body.steps.length).toBeGreaterThan(0);

    const backup = await npmRun('backup');
    expect(backup.code, backup.output).toBe(0);
    const file = /^backup: (.+)$/m.exec(backup.output)?.[1] ?? '';
    expect(path.dirname(file)).toBe(path.join(dataDir, 'backups'));
    expect(path.basename(file)).toMatch(/^tacklog-\d{8}-\d{6}Z\.dump$/);
    // pg_dump's custom format starts with the magic "PGDMP" (PostgreSQL documentation, pg_dump -Fc).
    expect(fs.readFileSync(file).subarray(0, 5).toString('latin1')).toBe('PGDMP');

    // Change what both traces show, after the backup.
    await sql(`UPDATE lots SET supplier_lot = supplier_lot || '-CHANGED' WHERE id = $1`, [lotId]);
    await sql(`UPDATE drivers SET status = 'scrapped' WHERE serial = $1`, [serial]);
    expect((await get(`/api/lots/${lotId}/trace`)).body).not.toEqual(lotBefore.body);
    expect((await get(`/api/drivers/${encodeURIComponent(serial)}/trace`)).body).not.toEqual(driverBefore.body);

    // The running server holds sessions: restore refuses without --force and changes nothing.
    const refused = await npmRun('restore', [file]);
    expect(refused.code).not.toBe(0);
    expect(refused.output).toMatch(/--force/);
    expect((await get<{ lot: { supplierLot: string } }>(`/api/lots/${lotId}/trace`)).body.lot.supplierLot).toMatch(/-CHANGED$/);
    // A file that is not a backup is refused before anything is touched.
    const junk = path.join(dataDir, 'not-a-backup.dump');
    fs.writeFileSync(junk, 'hello');
    const bad = await npmRun('restore', [junk, '--force']);
    expect(bad.code).not.toBe(0);
    expect(bad.output).toMatch(/not a backup/);

    const restored = await npmRun('restore', [file, '--force']);
    expect(restored.code, restored.output).toBe(0);
    expect(restored.output).toMatch(/restored: tacklog/);

    // The running server reconnects by itself and reads the restored data.
    expect(await getAfterSwap(`/api/lots/${lotId}/trace`)).toEqual(lotBefore.body);
    expect(await getAfterSwap(`/api/drivers/${encodeURIComponent(serial)}/trace`)).toEqual(driverBefore.body);
    // The data as it was before the restore is kept aside under its own name.
    const kept = await sql<{ datname: string }>(`SELECT datname FROM pg_database WHERE datname LIKE 'tacklog_before_restore_%'`);
    expect(kept).toHaveLength(1);
  });
});
