/**
 * Named prepared statements for hand-written SQL. node-postgres parses and plans a named
 * statement once per connection and reuses it, where an unnamed one is parsed again on every
 * call. Used on the hot paths (scans, loads, readings, traces).
 */
import type { SQL } from 'drizzle-orm';
import { PgDialect } from 'drizzle-orm/pg-core';
import type { ClientBase, QueryConfig, QueryResultRow } from 'pg';
import { pool, type DbOrTx } from './client';

const dialect = new PgDialect();

/** `q` as a node-postgres query config carrying `name`. One name must always mean one SQL text. */
export function namedQuery(name: string, q: SQL): QueryConfig {
  const { sql: text, params } = dialect.sqlToQuery(q);
  return { name, text, values: params as unknown[] };
}

/**
 * Runs `q` as the named statement `name` on the connection of `tx` (a transaction's own
 * client), or on the pool for the plain `db`. Rows come back with pg's own types
 * (timestamptz as Date, numeric as string, json parsed).
 */
export async function runNamed<R extends QueryResultRow>(tx: DbOrTx, name: string, q: SQL): Promise<R[]> {
  // A drizzle transaction keeps its pg client in its session (drizzle-orm/node-postgres/session).
  const client = (tx as unknown as { session?: { client?: ClientBase } }).session?.client;
  const config = namedQuery(name, q);
  const res =
    client && typeof (client as { release?: unknown }).release === 'function' ? await client.query<R>(config) : await pool.query<R>(config);
  return res.rows;
}
