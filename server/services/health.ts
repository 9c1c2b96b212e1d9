import { sql } from 'drizzle-orm';
import { db } from '../db/client';
import { isDatabaseUnavailable, noteDatabaseDown } from '../db/availability';
import { logger } from '../logger';

/** Whether PostgreSQL answers a query now (an unreachable database is logged once per outage). */
export async function checkDatabase(): Promise<boolean> {
  try {
    await db.execute(sql`SELECT 1`);
    return true;
  } catch (err) {
    if (isDatabaseUnavailable(err)) noteDatabaseDown(err);
    else logger.error({ err }, 'health: database check failed');
    return false;
  }
}
