import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema';
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
});

pool.on('error', (err) => {
  // An idle client lost its connection (e.g. the cluster stopped); the pool replaces it.
  logger.error({ err }, 'database: idle client error');
});

export const db: Db = drizzle(pool, { schema });

export async function closeDb(): Promise<void> {
  await pool.end();
}
