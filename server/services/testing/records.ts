import { asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { defectCodes, testResults, users } from '../../db/schema';
import type { TestRecord } from '../../../shared/schemas/tests';

/** A driver's final-test history, oldest first. */
export async function testHistory(dbx: DbOrTx, driverId: string): Promise<TestRecord[]> {
  const rows = await dbx
    .select({
      id: testResults.id,
      driverId: testResults.driverId,
      result: testResults.result,
      defectCode: testResults.defectCode,
      defectDescription: defectCodes.description,
      measurements: testResults.measurements,
      testedAt: testResults.testedAt,
      testedBy: testResults.testedBy,
      testedByName: users.name,
    })
    .from(testResults)
    .leftJoin(defectCodes, eq(defectCodes.code, testResults.defectCode))
    .leftJoin(users, eq(users.id, testResults.testedBy))
    .where(eq(testResults.driverId, driverId))
    .orderBy(asc(testResults.testedAt), asc(sql`${testResults.id}`));
  return rows.map(toTestRecord);
}

export function toTestRecord(r: {
  id: string;
  driverId: string;
  result: 'pass' | 'fail';
  defectCode: string | null;
  defectDescription: string | null;
  measurements: Record<string, number> | null;
  testedAt: Date;
  testedBy: string | null;
  testedByName: string | null;
}): TestRecord {
  return { ...r, testedAt: r.testedAt.toISOString() };
}
