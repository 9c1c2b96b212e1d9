/**
 * The demo seed writes history relative to the moment of seeding: no seeded event may lie after
 * that moment, whatever the hour (a seed at 03:47 once dated the morning's final tests at
 * 07:00–09:30, hours ahead). Seeds a scratch database at several plant hours, each inside a
 * transaction that is rolled back, and checks every timestamp column of every table.
 */
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as schema from '../../server/db/schema';
import { runMigrations } from '../../server/db/migrate';
import { seedPlant } from '../../server/db/seed/plant';
import { DEMO_ACCOUNTS } from '../../server/db/seed/users';
import { createScratchDatabase, type ScratchDatabase } from '../helpers/db';

/**
 * Columns that hold a PREDICTION, not an event, and so lie ahead by nature: when a mix's pot life
 * ends and when a finished step's adhesive reaches handling strength and full cure.
 */
const PREDICTIONS = new Set(['mixes.pot_life_ends_at', 'step_runs.handling_at', 'step_runs.cure_complete_at']);

let scratch: ScratchDatabase;
let pool: pg.Pool;

beforeAll(async () => {
  scratch = await createScratchDatabase('seedtimes');
  await runMigrations(scratch.url);
  pool = new pg.Pool({ connectionString: scratch.url, max: 2 });
});

afterAll(async () => {
  await pool?.end();
  await scratch?.drop();
});

class Rollback extends Error {}

/** Seeds the demo as if it were `now`, reports the latest value of every event column, rolls back. */
async function latestEventTimes(now: DateTime<true>): Promise<{ column: string; latest: Date }[]> {
  const db = drizzle(pool, { schema });
  let found: { column: string; latest: Date }[] = [];
  await db
    .transaction(async (tx) => {
      const rows = await tx
        .insert(schema.users)
        .values(DEMO_ACCOUNTS.map((a) => ({ ...a, passwordHash: 'not-a-real-hash' })))
        .returning({ id: schema.users.id, email: schema.users.email });
      await seedPlant(tx, Object.fromEntries(rows.map((r) => [r.email, r.id])), now);
      const client = (tx as unknown as { session: { client: pg.PoolClient } }).session.client;
      const cols = await client.query<{ table_name: string; column_name: string }>(
        `SELECT table_name, column_name FROM information_schema.columns
          WHERE table_schema = 'public' AND data_type IN ('timestamp with time zone', 'timestamp without time zone')
          ORDER BY table_name, column_name`,
      );
      const out: { column: string; latest: Date }[] = [];
      for (const c of cols.rows) {
        const column = `${c.table_name}.${c.column_name}`;
        if (PREDICTIONS.has(column)) continue;
        const r = await client.query<{ latest: Date | null }>(`SELECT max("${c.column_name}") AS latest FROM "${c.table_name}"`);
        if (r.rows[0].latest) out.push({ column, latest: r.rows[0].latest });
      }
      found = out;
      throw new Rollback();
    })
    .catch((err: unknown) => {
      if (!(err instanceof Rollback)) throw err;
    });
  return found;
}

describe('demo seed: every seeded event lies in the past', () => {
  // Seeding moments later than the real clock, so the columns a database default fills with
  // now() (created_at …) are in the past too. Hours chosen around the demo's working day:
  // before the 07:00 final tests, during them, at noon, late evening, and a Monday after a weekend.
  const tomorrow = DateTime.utc().plus({ days: 1 }).startOf('day') as DateTime<true>;
  const nextMonday = tomorrow.plus({ days: (8 - tomorrow.weekday) % 7 });
  const moments = [
    tomorrow.set({ hour: 3, minute: 47 }),
    tomorrow.set({ hour: 0, minute: 5 }),
    tomorrow.set({ hour: 8, minute: 10 }),
    tomorrow.set({ hour: 12, minute: 0 }),
    tomorrow.set({ hour: 23, minute: 55 }),
    nextMonday.set({ hour: 6, minute: 15 }),
  ];

  it.each(moments.map((m) => [m.toISO(), m] as const))('seeded at %s', { timeout: 180_000 }, async (_label, now) => {
    const latest = await latestEventTimes(now);
    // The seed wrote history: lots, step runs, final tests and readings have times.
    for (const column of ['lots.received_at', 'step_runs.started_at', 'test_results.tested_at', 'readings.at']) {
      expect(latest.map((l) => l.column)).toContain(column);
    }
    const future = latest.filter((l) => l.latest.getTime() > now.toMillis()).map((l) => `${l.column} = ${l.latest.toISOString()}`);
    expect(future, `seeded at ${now.toISO()}`).toEqual([]);
  });
});
