import { sql } from 'drizzle-orm';
import { db } from '../client';
import { users } from '../schema';
import { hashPassword } from '../../services/auth';
import { config } from '../../config';
import { DEMO_ACCOUNTS } from './users';

/**
 * Seeds the invented demo plant when the database has no users yet.
 * Dates are relative to now, so the demo never goes stale. Returns whether it seeded.
 */
export async function seedDemo(): Promise<{ seeded: boolean }> {
  const [{ n }] = (await db.execute(sql`SELECT count(*)::int AS n FROM users`)).rows as { n: number }[];
  if (n > 0) return { seeded: false };
  const passwordHash = await hashPassword(config.demoPassword);
  await db.transaction(async (tx) => {
    await tx.insert(users).values(DEMO_ACCOUNTS.map((a) => ({ ...a, passwordHash })));
  });
  return { seeded: true };
}
