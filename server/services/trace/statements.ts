import type { SQL } from 'drizzle-orm';
import { PgDialect } from 'drizzle-orm/pg-core';
import type { QueryConfig } from 'pg';
import { pool } from '../../db/client';

const dialect = new PgDialect();

/**
 * A trace statement as a named prepared statement: each pooled connection parses and plans it
 * once and reuses the plan (the trace joins a dozen tables, so planning would otherwise cost
 * more than running). Rows come back with pg's own types (timestamptz as Date).
 */
export function namedQuery(name: string, q: SQL): QueryConfig {
  const { sql: text, params } = dialect.sqlToQuery(q);
  return { name, text, values: params as unknown[] };
}

/** Runs the statements of one trace side by side on the pool; resolves to each one's rows. */
export async function runStatements<K extends string>(prefix: string, statements: Record<K, SQL>): Promise<Record<K, unknown[]>> {
  const keys = Object.keys(statements) as K[];
  const results = await Promise.all(keys.map((k) => pool.query(namedQuery(`${prefix}_${k}`, statements[k]))));
  return Object.fromEntries(keys.map((k, i) => [k, results[i].rows])) as Record<K, unknown[]>;
}
