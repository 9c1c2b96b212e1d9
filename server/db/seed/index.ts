import { sql } from 'drizzle-orm';
import { db } from '../client';
import { users } from '../schema';
import { hashPassword } from '../../services/auth';
import { config } from '../../config';
import { DEMO_ACCOUNTS } from './users';
import { seedPlant } from './plant';

/**
 * Seeds the invented demo plant when the database has no users yet: the demo accounts,
 * catalogue, stock, a few weeks of production history and today's work in progress.
 * Dates are relative to now, so the demo never goes stale. Returns whether it seeded.
 */
export async function seedDemo(): Promise<{ seeded: boolean }> {
  const [{ n }] = (await db.execute(sql`SELECT count(*)::int AS n FROM users`)).rows as { n: number }[];
  if (n > 0) return { seeded: false };
  const passwordHash = await hashPassword(config.demoPassword);
  await db.transaction(async (tx) => {
    const rows = await tx
      .insert(users)
      .values(DEMO_ACCOUNTS.map((a) => ({ ...a, passwordHash })))
      .returning({ id: users.id, email: users.email });
    await seedPlant(tx, Object.fromEntries(rows.map((r) => [r.email, r.id])));
  });
  return { seeded: true };
}
