/**
 * PostgreSQL for `npm start`, `npm run dev` and `npm test`.
 *
 * With DATABASE_URL set, that server is used and no cluster is started. Otherwise a
 * project-local cluster is made from Debian's packages (installed with apt-get when missing and
 * running as root): `.data/pg` for start/dev (kept between runs), a throwaway `.tmp/pg-test-*`
 * for tests. It listens only on 127.0.0.1, keeps its unix socket inside its own folder, trusts
 * local connections only, and is stopped when the script ends (Ctrl-C, SIGTERM, errors).
 * PostgreSQL refuses to run as root, so as root the cluster belongs to the `postgres` user.
 */
import { spawn, spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { aptInstall } from './lib/apt';
import { dataDir as projectDataDir, isRoot, log, onExit, root, runCapture, UserFacingError } from './lib/proc';

const PG_ROOT = '/usr/lib/postgresql';
const PG_USER = 'postgres';
/** Superuser of the project's own cluster (matches drizzle.config.ts). */
const SUPERUSER = 'tacklog';
/** A unix socket path must fit in sockaddr_un (108 bytes with the terminating NUL). */
const MAX_SOCKET_PATH = 100;

export interface PgServer {
  /** URL of database `name` on this server. */
  url(name: string): string;
  /** URL to connect to for CREATE/DROP DATABASE. */
  adminUrl: string;
  /** Whether this process started the cluster (and so stops it). */
  startedHere: boolean;
  /** Stops the cluster if this process started it; synchronous and idempotent. */
  stop(): void;
}

// ---------------------------------------------------------------- binaries and the postgres user

/** The bin folder of the highest PostgreSQL under /usr/lib/postgresql (or of `version`), if complete. */
export function findPgBin(version?: string): string | null {
  let versions: string[];
  try {
    versions = fs.readdirSync(PG_ROOT).filter((v) => /^\d+(\.\d+)?$/.test(v));
  } catch {
    return null;
  }
  versions.sort((a, b) => Number(b) - Number(a));
  for (const v of version ? versions.filter((x) => x === version) : versions) {
    const bin = path.join(PG_ROOT, v, 'bin');
    if (['initdb', 'pg_ctl', 'postgres'].every((exe) => fs.existsSync(path.join(bin, exe)))) return bin;
  }
  return null;
}

/** Finds PostgreSQL, installing Debian's package when running as root. */
export async function ensurePostgresInstalled(): Promise<string> {
  const found = findPgBin();
  if (found) return found;
  // Not as root, this stops with the command to run: sudo apt-get install -y postgresql
  await aptInstall(
    ['postgresql'],
    `PostgreSQL is not installed (nothing under ${PG_ROOT})`,
    'set DATABASE_URL to a PostgreSQL server you may use',
  );
  const bin = findPgBin();
  if (!bin) throw new UserFacingError(`apt-get installed postgresql but no initdb/pg_ctl/postgres was found under ${PG_ROOT}.`);
  return bin;
}

function ensurePostgresUser(): void {
  if (runCapture('id', ['-u', PG_USER]).ok) return;
  log(`creating the system user "${PG_USER}" to own the database cluster (PostgreSQL refuses to run as root)`);
  const made = runCapture('useradd', [
    '--system',
    '--user-group',
    '--no-create-home',
    '--home-dir',
    '/nonexistent',
    '--shell',
    '/usr/sbin/nologin',
    PG_USER,
  ]);
  if (!made.ok) throw new UserFacingError(`could not create the "${PG_USER}" user: ${made.output.trim()}`);
}

/** The command line for running a PostgreSQL program: as the postgres user when we are root. */
function asPgUser(cmd: string, args: string[]): [string, string[]] {
  return isRoot() ? ['runuser', ['-u', PG_USER, '--', cmd, ...args]] : [cmd, args];
}

function pgUserIds(): { uid: number; gid: number } {
  const uid = Number(runCapture('id', ['-u', PG_USER]).output.trim());
  const gid = Number(runCapture('id', ['-g', PG_USER]).output.trim());
  return { uid, gid };
}

/** Whether the postgres user can enter and write `dir` (all its parents must be traversable). */
function pgUserCanUse(dir: string): boolean {
  const [cmd, args] = asPgUser('test', ['-w', dir, '-a', '-x', dir]);
  return runCapture(cmd, args).ok;
}

/** Creates `dir` for the cluster, owned by the user that runs PostgreSQL. */
function makeOwnedDir(dir: string): void {
  fs.mkdirSync(path.dirname(dir), { recursive: true });
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  if (isRoot()) {
    const { uid, gid } = pgUserIds();
    fs.chownSync(dir, uid, gid);
    fs.chmodSync(dir, 0o700);
    // The project folder that holds it must let the postgres user pass through.
    const parent = path.dirname(dir);
    if (parent.startsWith(root) && (fs.statSync(parent).mode & 0o001) === 0) fs.chmodSync(parent, 0o755);
  }
}

/** A folder as people read it: relative inside the project, absolute elsewhere. */
function shown(dir: string): string {
  return dir.startsWith(root + path.sep) ? path.relative(root, dir) : dir;
}

// ---------------------------------------------------------------- ports

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export function portInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.once('error', () => resolve(true));
    srv.listen(port, '127.0.0.1', () => srv.close(() => resolve(false)));
  });
}

// ---------------------------------------------------------------- a crashed cluster's leftovers

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function isPostmaster(pid: number): boolean {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').includes('postgres');
  } catch {
    return processAlive(pid);
  }
}

/**
 * Reads postmaster.pid. Returns the port of a cluster that is really running from `dataDir`;
 * removes the file (and socket locks) when its process is gone, as after a crash.
 */
function checkPidFile(dataDir: string): number | null {
  const pidFile = path.join(dataDir, 'postmaster.pid');
  if (!fs.existsSync(pidFile)) return null;
  const lines = fs.readFileSync(pidFile, 'utf8').split('\n');
  const pid = Number(lines[0]);
  if (Number.isInteger(pid) && pid > 0 && processAlive(pid) && isPostmaster(pid)) {
    const port = Number(lines[3]);
    return Number.isInteger(port) && port > 0 ? port : null;
  }
  log('removing a stale postmaster.pid (the cluster was not shut down cleanly last time)');
  fs.rmSync(pidFile, { force: true });
  const socketDir = lines[4]?.trim();
  if (socketDir && fs.existsSync(socketDir)) {
    for (const f of fs.readdirSync(socketDir)) if (f.startsWith('.s.PGSQL.')) fs.rmSync(path.join(socketDir, f), { force: true });
  }
  return null;
}

// ---------------------------------------------------------------- the cluster

function shellQuote(s: string): string {
  return `'${s.replace(/'/g, `'\\''`)}'`;
}

/** Runs pg_ctl in its own process group, so a terminal's Ctrl-C reaches us and not the postmaster. */
function runDetached(cmd: string, args: string[]): Promise<{ ok: boolean; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d: Buffer) => (output += d.toString()));
    child.stderr.on('data', (d: Buffer) => (output += d.toString()));
    child.on('error', (err) => resolve({ ok: false, output: output + err.message }));
    child.on('exit', (code) => resolve({ ok: code === 0, output }));
  });
}

function tail(file: string, lines = 20): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no log)';
  }
}

async function waitUntilAccepting(url: string, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const client = new pg.Client({ connectionString: url });
    try {
      await client.connect();
      await client.query('SELECT 1');
      return;
    } catch (err) {
      if (Date.now() > deadline) throw new UserFacingError(`PostgreSQL did not accept connections: ${(err as Error).message}`);
      await new Promise((r) => setTimeout(r, 200));
    } finally {
      await client.end().catch(() => undefined);
    }
  }
}

export interface LocalClusterOptions {
  /** The cluster's data folder (created when missing). */
  dataDir: string;
  port: number;
  /** A test cluster: faster unsafe settings, and its folder is removed when it stops. */
  throwaway?: boolean;
}

/** Starts (initialising when new) a project-local cluster, or reuses one already running there. */
export async function startLocalCluster(options: LocalClusterOptions): Promise<PgServer> {
  const { throwaway = false } = options;
  let { dataDir, port } = options;
  const latestBin = await ensurePostgresInstalled();
  if (isRoot()) ensurePostgresUser();

  makeOwnedDir(dataDir);
  if (isRoot() && !pgUserCanUse(dataDir)) {
    // A parent folder (e.g. a home folder with mode 700) keeps the postgres user out.
    const fallback = throwaway
      ? fs.mkdtempSync(path.join(os.tmpdir(), 'tacklog-pg-test-'))
      : path.join('/var/tmp', `tacklog-pg-${crypto.createHash('sha1').update(root).digest('hex').slice(0, 10)}`);
    log(`the "${PG_USER}" user cannot reach ${dataDir} (a parent folder is closed to it); using ${fallback} instead`);
    // Remove the folder just made for it, but never one that holds anything.
    if (fs.readdirSync(dataDir).length === 0) fs.rmdirSync(dataDir);
    dataDir = fallback;
    makeOwnedDir(dataDir);
  }

  const versionFile = path.join(dataDir, 'PG_VERSION');
  let bin = latestBin;
  if (fs.existsSync(versionFile)) {
    const version = fs.readFileSync(versionFile, 'utf8').trim();
    const matching = findPgBin(version);
    if (!matching) {
      throw new UserFacingError(
        `The cluster in ${dataDir} was made by PostgreSQL ${version}, which is not installed. ` +
          `Install postgresql-${version}, or remove ${dataDir} to start afresh (its data is lost).`,
      );
    }
    bin = matching;
  } else {
    log(`initialising a PostgreSQL cluster in ${shown(dataDir)}`);
    const [cmd, args] = asPgUser(path.join(bin, 'initdb'), [
      '-D',
      dataDir,
      `--username=${SUPERUSER}`,
      '--auth=trust',
      '--encoding=UTF8',
      '--no-locale',
      '--no-instructions',
    ]);
    const made = runCapture(cmd, args);
    if (!made.ok) throw new UserFacingError(`initdb failed:\n${made.output}`);
  }

  const pgCtl = path.join(bin, 'pg_ctl');
  const urls = (p: number) => ({
    adminUrl: `postgres://${SUPERUSER}@127.0.0.1:${p}/postgres`,
    url: (name: string) => `postgres://${SUPERUSER}@127.0.0.1:${p}/${encodeURIComponent(name)}`,
  });

  // Which process runs the cluster of a kept folder, so a second script can tell a cluster in
  // use (shared, left running) from one whose script was killed (taken over, stopped with us).
  const ownerFile = `${dataDir}.owner`;
  const readOwner = () => {
    try {
      return Number(fs.readFileSync(ownerFile, 'utf8').trim());
    } catch {
      return 0;
    }
  };
  const claim = () => {
    if (!throwaway) fs.writeFileSync(ownerFile, `${process.pid}\n`);
  };

  // What this process started, so that every way out stops it.
  const state = { mayBeRunning: false, socketTmp: null as string | null, postmasterPid: 0 };
  const postmasterPid = () => {
    try {
      return Number(fs.readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
    } catch {
      return 0;
    }
  };
  const pgCtlStop = (): 'stopped' | 'failed' | 'none' => {
    if (!state.mayBeRunning) return 'none';
    state.mayBeRunning = false;
    // Only the postmaster we started or took over: not a later one in the same folder.
    if (state.postmasterPid !== 0 && postmasterPid() !== state.postmasterPid) return 'none';
    const [cmd, args] = asPgUser(pgCtl, ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
    if (spawnSync(cmd, args, { encoding: 'utf8' }).status === 0) return 'stopped';
    const [c2, a2] = asPgUser(pgCtl, ['-D', dataDir, '-m', 'immediate', '-w', 'stop']);
    return spawnSync(c2, a2, { encoding: 'utf8' }).status === 0 ? 'stopped' : 'failed';
  };
  const removeSocketTmp = () => {
    if (state.socketTmp) fs.rmSync(state.socketTmp, { recursive: true, force: true });
    state.socketTmp = null;
  };
  let stopped = false;
  const stop = () => {
    if (stopped) return;
    stopped = true;
    const result = pgCtlStop();
    if (result === 'stopped') log('PostgreSQL stopped');
    if (result === 'failed') log('PostgreSQL did not stop cleanly (see its server.log)');
    removeSocketTmp();
    if (throwaway) fs.rmSync(dataDir, { recursive: true, force: true });
    else if (readOwner() === process.pid) fs.rmSync(ownerFile, { force: true });
  };
  onExit(stop);

  const runningPort = checkPidFile(dataDir);
  if (runningPort !== null) {
    const where = shown(dataDir);
    const owner = readOwner();
    if (owner > 0 && owner !== process.pid && processAlive(owner)) {
      log(`PostgreSQL is already running from ${where} on port ${runningPort} for process ${owner}; sharing it (it is left running)`);
      stopped = true;
      const shared: PgServer = { ...urls(runningPort), startedHere: false, stop() {} };
      await waitUntilAccepting(shared.adminUrl);
      return shared;
    }
    log(`PostgreSQL was left running from ${where} on port ${runningPort}; taking it over (it stops when this script does)`);
    state.mayBeRunning = true;
    state.postmasterPid = postmasterPid();
    claim();
    const adopted: PgServer = { ...urls(runningPort), startedHere: true, stop };
    await waitUntilAccepting(adopted.adminUrl);
    return adopted;
  }

  for (let attempt = 1; ; attempt++) {
    if (await portInUse(port)) {
      if (!throwaway) {
        throw new UserFacingError(`Port ${port} on 127.0.0.1 is taken by another program; set TACKLOG_PG_PORT to a free port.`);
      }
      port = await freePort();
    }
    let socketDir = dataDir;
    if (`${socketDir}/.s.PGSQL.${port}.lock`.length > MAX_SOCKET_PATH) {
      state.socketTmp = fs.mkdtempSync(path.join(os.tmpdir(), 'tacklog-sock-'));
      makeOwnedDir(state.socketTmp);
      socketDir = state.socketTmp;
    }
    const settings = [
      '-c listen_addresses=127.0.0.1',
      `-p ${port}`,
      `-k ${shellQuote(socketDir)}`,
      // A throwaway test cluster needs no crash safety.
      ...(throwaway ? ['-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off'] : []),
    ].join(' ');
    const logFile = path.join(dataDir, 'server.log');
    log(`starting PostgreSQL on 127.0.0.1:${port}`);
    state.mayBeRunning = true;
    const [cmd, args] = asPgUser(pgCtl, ['-D', dataDir, '-l', logFile, '-w', '-t', '60', '-o', settings, 'start']);
    const started = await runDetached(cmd, args);
    if (started.ok) {
      state.postmasterPid = postmasterPid();
      claim();
      const server: PgServer = { ...urls(port), startedHere: true, stop };
      await waitUntilAccepting(server.adminUrl);
      return server;
    }
    const failure = `PostgreSQL did not start:\n${started.output.trim()}\n--- ${logFile} ---\n${tail(logFile)}`;
    pgCtlStop();
    removeSocketTmp();
    if (!throwaway || attempt >= 3) throw new UserFacingError(failure);
    log('PostgreSQL did not start; trying another port');
    port = await freePort();
  }
}

/** The server behind an existing DATABASE_URL; nothing to start or stop. */
export function externalServer(databaseUrl: string): PgServer {
  return {
    adminUrl: databaseUrl,
    url: (name) => {
      const u = new URL(databaseUrl);
      u.pathname = `/${encodeURIComponent(name)}`;
      return u.toString();
    },
    startedHere: false,
    stop() {},
  };
}

function quoteIdent(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

async function withAdmin<T>(server: PgServer, fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: server.adminUrl });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

/** Creates database `name` unless it exists. */
export async function ensureDatabase(server: PgServer, name: string): Promise<string> {
  await withAdmin(server, async (client) => {
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (found.rowCount === 0) {
      log(`creating database ${name}`);
      await client.query(`CREATE DATABASE ${quoteIdent(name)}`);
    }
  });
  return server.url(name);
}

/** Drops database `name`, disconnecting anyone still using it. */
export async function dropDatabase(server: PgServer, name: string): Promise<void> {
  await withAdmin(server, (client) => client.query(`DROP DATABASE IF EXISTS ${quoteIdent(name)} WITH (FORCE)`));
}

/**
 * The PostgreSQL server for a script: DATABASE_URL's server when set, otherwise the project's
 * cluster in .data/pg (TACKLOG_DATA_DIR/pg; start/dev, port TACKLOG_PG_PORT or 54329) or a
 * throwaway one (test).
 */
export async function providePostgres(kind: 'persistent' | 'throwaway'): Promise<PgServer> {
  const external = process.env.DATABASE_URL;
  if (external) {
    log('DATABASE_URL is set: using that PostgreSQL server (no local cluster is started)');
    return externalServer(external);
  }
  if (kind === 'persistent') {
    const port = Number(process.env.TACKLOG_PG_PORT || 54329);
    if (!Number.isInteger(port) || port <= 0 || port > 65535)
      throw new UserFacingError(`TACKLOG_PG_PORT must be a port number, got "${process.env.TACKLOG_PG_PORT}"`);
    return startLocalCluster({ dataDir: path.join(projectDataDir(), 'pg'), port });
  }
  const dataDir = path.join(root, '.tmp', `pg-test-${crypto.randomBytes(4).toString('hex')}`);
  return startLocalCluster({ dataDir, port: await freePort(), throwaway: true });
}
