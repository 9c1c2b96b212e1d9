/**
 * batch_outcomes, kept by triggers, says per batch what a recount of drivers and final tests says:
 * drivers built, drivers tested at least once, drivers failed at least once (the counts the lot
 * statistics test against the plant's baseline).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { batchOutcomes, defectCodes, testResults } from '../../server/db/schema';
import { migrateTestDatabase } from '../helpers/db';
import { createBatch, createModel, createStation } from '../helpers/fixtures';

beforeAll(async () => {
  await migrateTestDatabase();
  await db.insert(defectCodes).values({ code: 'TBO', description: 'Outcome test defect' }).onConflictDoNothing();
});

async function recount(batchId: string) {
  const res = await db.execute<{ drivers: number; tested: number; failed: number }>(sql`
    SELECT count(*)::int AS drivers, count(t.driver_id)::int AS tested, (count(*) FILTER (WHERE t.failed))::int AS failed
    FROM drivers d LEFT JOIN (SELECT driver_id, bool_or(result = 'fail') AS failed FROM test_results GROUP BY driver_id) t ON t.driver_id = d.id
    WHERE d.batch_id = ${batchId}`);
  return res.rows[0];
}

describe('batch outcomes', () => {
  it('count drivers, first tests and first failures as a recount does', async () => {
    const station = await createStation({ kind: 'outcome_bench' });
    const model = await createModel({ steps: [{ stationKind: station.kind }] });
    const batch = await createBatch({ modelId: model.id, quantity: 4 });
    const [a, b, c] = batch.drivers;
    const stored = async () => (await db.select().from(batchOutcomes).where(eq(batchOutcomes.batchId, batch.id)))[0];
    expect(await stored()).toMatchObject({ drivers: 4, tested: 0, failed: 0 });

    await db.insert(testResults).values({ driverId: a.id, result: 'pass' });
    await db.insert(testResults).values({ driverId: b.id, result: 'fail', defectCode: 'TBO' });
    // Re-tests: a second failure and a later pass of the failed driver count once; a fail after a pass counts.
    await db.insert(testResults).values({ driverId: b.id, result: 'fail', defectCode: 'TBO' });
    await db.insert(testResults).values({ driverId: b.id, result: 'pass' });
    await db.insert(testResults).values({ driverId: c.id, result: 'pass' });
    await db.insert(testResults).values({ driverId: c.id, result: 'fail', defectCode: 'TBO' });
    expect(await stored()).toMatchObject({ drivers: 4, tested: 3, failed: 2 });
    expect(await stored()).toMatchObject(await recount(batch.id));
  });

  it('refuses to move a test result to another driver or change its result', async () => {
    const station = await createStation({ kind: 'outcome_bench' });
    const model = await createModel({ steps: [{ stationKind: station.kind }] });
    const batch = await createBatch({ modelId: model.id, quantity: 1 });
    const [row] = await db.insert(testResults).values({ driverId: batch.drivers[0].id, result: 'pass' }).returning();
    const err = await db
      .update(testResults)
      .set({ result: 'fail', defectCode: 'TBO' })
      .where(eq(testResults.id, row.id))
      .then(
        () => null,
        (e: Error) => e,
      );
    expect(String((err?.cause as Error | undefined)?.message)).toMatch(/would leave batch_outcomes wrong/);
  });
});
