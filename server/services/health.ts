import { sql } from 'drizzle-orm';
import { db } from '../db/client';

export async function checkDatabase(): Promise<boolean> {
  try {
    await db.execute(sql`SELECT 1`);
    return true;
  } catch (err) {
    console.error('[health] database check failed:', (err as Error).message);
    return false;
  }
}
