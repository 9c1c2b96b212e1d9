import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema';
import { isDatabaseUnavailable, noteDatabaseDown, noteDatabaseUp } from './availability';
import { logger } from '../logger';

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle; services take `Db | Tx` so they compose inside transactions. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;

// Numeric columns come back as strings by default; timestamps as Date.
const url = process.env.DATABASE_URL;

export const pool = new pg.Pool({
  connectionString: url,
  max: Number(process.env.TACKLOG_DB_POOL ?? 10),
  // A database that does not answer (host gone, packets dropped) fails a request in seconds
  // with 503 rather than holding it until the client gives up.
  connectionTimeoutMillis: Number(process.env.TACKLOG_DB_CONNECT_TIMEOUT_MS ?? 5000),
});

function onClientError(err: Error): void {
  // The request using the client (if any) gets the error through its query; here it is only
  // recorded. Without a listener a dead connection would be an uncaught 'error' event.
  if (isDatabaseUnavailable(err)) noteDatabaseDown(err);
  else logger.error({ err }, 'database: connection error');
}

// An idle client lost its connection (e.g. the cluster stopped); the pool replaces it.
pool.on('error', onClientError);
pool.on('connect', (client) => {
  noteDatabaseUp();
  // node-postgres removes the pool's listener while a client is checked out (inside a request or
  // a transaction): one of our own keeps a connection dying then from crashing the process.
  client.on('error', onClientError);
});

export const db: Db = drizzle(pool, { schema });

export async function closeDb(): Promise<void> {
  await pool.end();
}
