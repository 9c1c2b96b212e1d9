/**
 * Named prepared statements for hand-written SQL. node-postgres parses and plans a named
 * statement once per connection and reuses it, where an unnamed one is parsed again on every
 * call. Used on the hot paths (scans, loads, readings, traces).
 */
import { fillPlaceholders, type SQL } from 'drizzle-orm';
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
  return (await queryOn<R>(tx, namedQuery(name, q))).rows;
}

/** On the connection of `tx` (a transaction's own client), or on the pool for the plain `db`. */
function queryOn<R extends QueryResultRow>(tx: DbOrTx, config: QueryConfig) {
  // A drizzle transaction keeps its pg client in its session (drizzle-orm/node-postgres/session).
  const client = (tx as unknown as { session?: { client?: ClientBase } }).session?.client;
  return client && typeof (client as { release?: unknown }).release === 'function' ? client.query<R>(config) : pool.query<R>(config);
}

/**
 * A named statement whose text is built once: `q` names its inputs with sql.placeholder('x'),
 * and each call fills them from `values`. For the hottest paths, where building the SQL again
 * on every call (drizzle's template walk) was a tenth of the server's CPU.
 */
export function namedStatement<V extends object, R extends QueryResultRow>(name: string, q: SQL) {
  const { sql: text, params } = dialect.sqlToQuery(q);
  return async (tx: DbOrTx, values: V): Promise<R[]> =>
    (await queryOn<R>(tx, { name, text, values: fillPlaceholders(params, values as Record<string, unknown>) as unknown[] })).rows;
}
