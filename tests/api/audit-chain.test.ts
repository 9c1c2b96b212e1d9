import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { verifyAuditChain } from '../../server/services/audit-chain';
import { sweep } from '../../server/services/compliance';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser } from '../helpers/db';

// Tamper evidence of the audit trail (21 CFR Part 11 §11.10(e): secure, time-stamped audit
// trails whose changes do not obscure earlier values). Each row carries the previous row's
// hash; its own hash is SHA-256 over its canonical text and that hash.

async function addEntries(n: number): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < n; i++) {
    const res = await db.execute<{ id: string }>(
      sql`INSERT INTO audit_log (action, entity_type, entity_id, before, after) VALUES ('test.chain', 'test', ${`c${i}`}, '{"v":0}', ${JSON.stringify({ v: i + 1, note: 'ünïcode ✓' })}) RETURNING id`,
    );
    ids.push(Number(res.rows[0].id));
  }
  return ids;
}

/** Alters a row behind the append-only trigger's back, as someone with database access could. */
async function tamper(id: number, after: unknown): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.execute(sql`ALTER TABLE audit_log DISABLE TRIGGER audit_log_no_update_delete`);
    await tx.execute(sql`UPDATE audit_log SET after = ${JSON.stringify(after)}::jsonb WHERE id = ${id}`);
    await tx.execute(sql`ALTER TABLE audit_log ENABLE TRIGGER audit_log_no_update_delete`);
  });
}

const run = promisify(execFile);

describe('audit chain', () => {
  let app: TestApp;
  let ids: number[];
  beforeAll(async () => {
    app = await startApp();
    ids = await addEntries(5);
  });
  afterAll(() => app.close());

  it('seals every committed row, linked to the one before it', async () => {
    const rows = (
      await db.execute<{ id: string; prev_hash: string | null; hash: string; chain_seq: string }>(
        sql`SELECT id, prev_hash, hash, chain_seq FROM audit_log WHERE id = ANY(${sql.raw(`ARRAY[${ids.join(',')}]::bigint[]`)}) ORDER BY chain_seq`,
      )
    ).rows;
    expect(rows).toHaveLength(5);
    for (let i = 1; i < rows.length; i++) expect(rows[i].prev_hash).toBe(rows[i - 1].hash);
    for (const r of rows) expect(r.hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('stays linear when many transactions write at once', async () => {
    await Promise.all(
      Array.from({ length: 30 }, (_, i) =>
        db.execute(sql`INSERT INTO audit_log (action, entity_type, entity_id) VALUES ('test.parallel', 'test', ${`p${i}`})`),
      ),
    );
    const result = await verifyAuditChain();
    expect(result).toMatchObject({ ok: true, firstBroken: null });
  });

  it('reports intact through the API, for quality and admin only', async () => {
    const qa = await ensureUser(['quality']);
    const res = await api(app.baseUrl, qa.token).post('/api/audit/verify');
    expect(res.status).toBe(200);
    expect(res.body.ok).toBe(true);
    expect(res.body.checked).toBeGreaterThanOrEqual(35);
    const clerk = await ensureUser(['receiving']);
    expect((await api(app.baseUrl, clerk.token).post('/api/audit/verify')).status).toBe(403);
    expect((await api(app.baseUrl).post('/api/audit/verify')).status).toBe(401);
  });

  it('finds a row altered in the database, by id, through the service, the API and npm run audit:verify', async () => {
    const target = ids[2];
    await tamper(target, { v: 999 });
    try {
      const result = await verifyAuditChain();
      expect(result.ok).toBe(false);
      expect(result.firstBroken?.id).toBe(target);

      const admin = await ensureUser(['admin']);
      const res = await api(app.baseUrl, admin.token).post('/api/audit/verify');
      expect(res.body).toMatchObject({ ok: false, firstBroken: { id: target } });

      const root = path.resolve(__dirname, '..', '..');
      const failed = await run(process.execPath, ['--import', 'tsx', 'scripts/audit-verify.ts'], { cwd: root, env: process.env }).then(
        () => null,
        (err: { code: number; stdout: string; stderr: string }) => err,
      );
      expect(failed?.code).toBe(1);
      expect(`${failed?.stdout}${failed?.stderr}`).toContain(`BROKEN at entry ${target}`);

      // The watch raises a critical alert for it (it verifies when its last check is a day old).
      await db.execute(sql`DELETE FROM settings WHERE key = 'auditChainLastCheck'`);
      await sweep();
      const alert = (
        await db.execute<{ severity: string; subject_id: string }>(
          sql`SELECT severity, subject_id FROM alerts WHERE kind = 'audit_chain_broken' AND state <> 'resolved'`,
        )
      ).rows;
      expect(alert).toEqual([{ severity: 'critical', subject_id: String(target) }]);
    } finally {
      // Put the row back as it was: the chain verifies again.
      await tamper(target, { v: 3, note: 'ünïcode ✓' });
      await db.execute(sql`DELETE FROM settings WHERE key = 'auditChainLastCheck'`);
    }
    expect((await verifyAuditChain()).ok).toBe(true);
  });

  it('finds a removed row by the broken link after it', async () => {
    const target = ids[1];
    const [row] = (await db.execute<Record<string, unknown>>(sql`SELECT * FROM audit_log WHERE id = ${target}`)).rows;
    await db.transaction(async (tx) => {
      await tx.execute(sql`ALTER TABLE audit_log DISABLE TRIGGER audit_log_no_update_delete`);
      await tx.execute(sql`DELETE FROM audit_log WHERE id = ${target}`);
      await tx.execute(sql`ALTER TABLE audit_log ENABLE TRIGGER audit_log_no_update_delete`);
    });
    try {
      const result = await verifyAuditChain();
      expect(result.ok).toBe(false);
      expect(result.firstBroken?.id).toBe(ids[2]);
    } finally {
      await db.transaction(async (tx) => {
        await tx.execute(sql`ALTER TABLE audit_log DISABLE TRIGGER audit_log_seal`);
        await tx.execute(sql`INSERT INTO audit_log (id, at, actor_id, action, entity_type, entity_id, before, after, reason, chain_seq, prev_hash, hash)
          VALUES (${row.id}, ${row.at}, ${row.actor_id}, ${row.action}, ${row.entity_type}, ${row.entity_id}, ${JSON.stringify(row.before)}::jsonb, ${JSON.stringify(row.after)}::jsonb, ${row.reason}, ${row.chain_seq}, ${row.prev_hash}, ${row.hash})`);
        await tx.execute(sql`ALTER TABLE audit_log ENABLE TRIGGER audit_log_seal`);
      });
    }
    expect((await verifyAuditChain()).ok).toBe(true);
  });

  it('lists entries newest first with filters and a cursor, for quality and admin', async () => {
    const qa = await ensureUser(['quality']);
    const first = await api(app.baseUrl, qa.token).get('/api/audit?action=test.chain&limit=2');
    expect(first.status).toBe(200);
    expect(first.body.items.map((i: { id: number }) => i.id)).toEqual([ids[4], ids[3]]);
    expect(first.body.items[0]).toMatchObject({ entity: 'test', entityId: 'c4', after: { v: 5 }, actor: null });
    const next = await api(app.baseUrl, qa.token).get(`/api/audit?action=test.chain&limit=2&cursor=${first.body.nextCursor}`);
    expect(next.body.items.map((i: { id: number }) => i.id)).toEqual([ids[2], ids[1]]);
    const bad = await api(app.baseUrl, qa.token).get('/api/audit?from=2026-02-30');
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body.error.details)).toContain('from');
    const buyer = await ensureUser(['purchasing']);
    expect((await api(app.baseUrl, buyer.token).get('/api/audit')).status).toBe(403);
  });
});
