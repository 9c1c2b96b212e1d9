/** The database the app uses and PostgreSQL's client programs, for backup and restore. */
import path from 'node:path';
import { ensurePostgresInstalled, providePostgres, type PgServer } from '../pg';
import { UserFacingError } from './proc';

export interface AppDatabase {
  server: PgServer;
  /** URL of the app's database. */
  url: string;
  /** Its name. */
  name: string;
  /** URL of the server's `postgres` database, for CREATE/ALTER/DROP DATABASE. */
  adminUrl: string;
  /** Folder of pg_dump, pg_restore … */
  bin: string;
}

/**
 * The same provisioning as `npm start`: DATABASE_URL's server and database when set, otherwise
 * the project's cluster in .data/pg (shared when `npm start` runs it, else started for the
 * duration of the command) and its `tacklog` database.
 */
export async function appDatabase(): Promise<AppDatabase> {
  const bin = path.dirname(path.join(await ensurePostgresInstalled(), 'pg_dump'));
  const server = await providePostgres('persistent');
  const url = process.env.DATABASE_URL || server.url('tacklog');
  const name = decodeURIComponent(new URL(url).pathname.replace(/^\//, ''));
  if (!name) throw new UserFacingError('DATABASE_URL names no database (postgres://user@host:port/DATABASE).');
  return { server, url, name, adminUrl: server.url('postgres'), bin };
}
