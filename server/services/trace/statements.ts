import type { SQL } from 'drizzle-orm';
import { pool } from '../../db/client';
import { namedQuery } from '../../db/named';

export { namedQuery };

/**
 * Runs the statements of one trace side by side on the pool, each a named prepared statement
 * (the trace joins a dozen tables, so planning would otherwise cost more than running);
 * resolves to each one's rows.
 */
export async function runStatements<K extends string>(prefix: string, statements: Record<K, SQL>): Promise<Record<K, unknown[]>> {
  const keys = Object.keys(statements) as K[];
  const results = await Promise.all(keys.map((k) => pool.query(namedQuery(`${prefix}_${k}`, statements[k]))));
  return Object.fromEntries(keys.map((k, i) => [k, results[i].rows])) as Record<K, unknown[]>;
}
