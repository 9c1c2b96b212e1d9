/** Installing Debian packages the scripts need (as root only; otherwise say the command). */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { isRoot, log, run, UserFacingError } from './proc';

let updated = false;

/**
 * How long apt-get waits for another package manager (unattended upgrades, a second apt-get) to
 * release the dpkg and list locks before giving up, in seconds. TACKLOG_APT_LOCK_TIMEOUT overrides.
 */
function lockTimeoutSeconds(): number {
  const raw = process.env.TACKLOG_APT_LOCK_TIMEOUT;
  const n = raw === undefined || raw === '' ? 600 : Number(raw);
  if (!Number.isInteger(n) || n < 0) throw new UserFacingError(`TACKLOG_APT_LOCK_TIMEOUT must be a whole number of seconds, got "${raw}"`);
  return n;
}

/** The dpkg and apt lock files another package manager may hold. */
const LOCK_FILES = ['/var/lib/dpkg/lock-frontend', '/var/lib/dpkg/lock', '/var/lib/apt/lists/lock', '/var/cache/apt/archives/lock'];

/** Whether another process holds one of the package manager's locks (fuser, when installed). */
function lockHolder(): string | null {
  for (const file of LOCK_FILES) {
    // fuser prints the process ids on stdout (and the file name and notes on stderr).
    const held = spawnSync('fuser', [file], { encoding: 'utf8' });
    const pids = (held.stdout ?? '')
      .trim()
      .split(/\s+/)
      .filter((p) => /^\d+/.test(p));
    if (held.status === 0 && pids.length > 0) return `${file} (process ${pids.join(', ')})`;
  }
  return null;
}

/** apt-get with a lock timeout, saying first that it will wait when another one is busy. */
async function aptGet(args: string[], env: NodeJS.ProcessEnv): Promise<void> {
  const timeout = lockTimeoutSeconds();
  const deadline = Date.now() + timeout * 1000;
  let holder = lockHolder();
  if (holder) {
    log(`another package manager holds ${holder}; waiting up to ${Math.round(timeout / 60)} min for it to finish`);
    let nextNote = Date.now() + 30_000;
    while (holder && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 2000));
      holder = lockHolder();
      if (holder && Date.now() >= nextNote) {
        log(`still waiting for the package manager lock: ${holder}`);
        nextNote = Date.now() + 30_000;
      }
    }
    if (!holder) log('the package manager lock is free; going on');
  }
  // apt-get waits for the lock itself as well (and says "Waiting for cache lock"), for the time left.
  const left = Math.max(0, Math.ceil((deadline - Date.now()) / 1000));
  await run('apt-get', ['-o', `DPkg::Lock::Timeout=${left}`, ...args], { env });
}

/**
 * Installs `packages` with apt-get when running as root, printing what it does. Another package
 * manager at work (the dpkg lock held) is waited for, up to 10 minutes, and the wait is said;
 * apt-get itself prints "Waiting for cache lock" while it waits. Not as root, it
 * stops with the exact command to run. `why` says what is missing; `alternative` another way out.
 */
export async function aptInstall(packages: string[], why: string, alternative = ''): Promise<void> {
  const list = packages.join(' ');
  if (!isRoot()) {
    throw new UserFacingError(
      `${why}. Install Debian's package, then run this again:\n\n    sudo apt-get install -y ${list}\n\n(run "sudo apt-get update" first if apt cannot find it)${alternative ? `, or ${alternative}` : ''}.`,
    );
  }
  log(`${why}; installing Debian's package:`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!updated) {
    log('  apt-get update');
    await aptGet(['update'], env);
    updated = true;
  }
  log(`  apt-get install -y ${list}`);
  await aptGet(['install', '-y', ...packages], env);
}

/** Debian's chromium, which the browser tests and the benchmark's first-page measurement drive. */
export const CHROMIUM = '/usr/bin/chromium';

/**
 * Installs Debian's package `pkg` when the program `file` it brings is missing (as root;
 * otherwise says the command). `why` says who needs it: "Browser tests".
 */
export async function ensureDebianProgram(pkg: string, file: string, why: string): Promise<void> {
  if (fs.existsSync(file)) return;
  await aptInstall([pkg], `${why} need Debian's ${pkg} at ${file}`);
  if (!fs.existsSync(file)) throw new UserFacingError(`${pkg} was installed but ${file} is still missing.`);
}

/** Installs Debian's chromium when it is missing (as root; otherwise says the command). */
export function ensureChromium(why: string): Promise<void> {
  return ensureDebianProgram('chromium', CHROMIUM, why);
}
