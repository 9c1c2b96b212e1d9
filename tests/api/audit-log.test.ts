import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { migrateTestDatabase } from '../helpers/db';

// 21 CFR Part 11 §11.10(e): audit trails must not obscure earlier values. The audit_log table
// refuses UPDATE, DELETE and TRUNCATE (trigger in drizzle/0001_audit_log_append_only.sql).
/** The database's own message (drizzle wraps the driver's error as `cause`). */
async function refusal(query: Promise<unknown>): Promise<string> {
  try {
    await query;
  } catch (err) {
    const cause = (err as { cause?: { message?: string } }).cause;
    return cause?.message ?? (err as Error).message;
  }
  return 'no error';
}

describe('audit log is append-only', () => {
  let id: number;
  beforeAll(async () => {
    await migrateTestDatabase();
    const res = await db.execute<{ id: number }>(
      sql`INSERT INTO audit_log (action, entity_type, entity_id, after) VALUES ('test.append', 'test', 'x', '{"v":1}') RETURNING id`,
    );
    id = Number(res.rows[0].id);
  });

  it('keeps a new entry', async () => {
    const res = await db.execute(sql`SELECT action FROM audit_log WHERE id = ${id}`);
    expect(res.rows[0]).toEqual({ action: 'test.append' });
  });

  it.each(['UPDATE', 'DELETE'])('refuses %s', async (op) => {
    const stmt =
      op === 'UPDATE' ? sql`UPDATE audit_log SET action = 'changed' WHERE id = ${id}` : sql`DELETE FROM audit_log WHERE id = ${id}`;
    expect(await refusal(db.execute(stmt))).toMatch(/append-only/);
    const res = await db.execute(sql`SELECT action FROM audit_log WHERE id = ${id}`);
    expect(res.rows[0]).toEqual({ action: 'test.append' });
  });

  it('refuses TRUNCATE', async () => {
    expect(await refusal(db.execute(sql`TRUNCATE audit_log`))).toMatch(/append-only/);
  });
});
