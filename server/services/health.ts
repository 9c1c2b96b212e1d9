import { sql } from 'drizzle-orm';
import { db } from '../db/client';
import { logger } from '../logger';

export async function checkDatabase(): Promise<boolean> {
  try {
    await db.execute(sql`SELECT 1`);
    return true;
  } catch (err) {
    logger.error({ err }, 'health: database check failed');
    return false;
  }
}
