/** Installing Debian packages the scripts need (as root only; otherwise say the command). */
import { isRoot, log, run, UserFacingError } from './proc';

let updated = false;

/**
 * Installs `packages` with apt-get when running as root, printing what it does. Not as root, it
 * stops with the exact command to run. `why` says what is missing; `alternative` another way out.
 */
export async function aptInstall(packages: string[], why: string, alternative = ''): Promise<void> {
  const list = packages.join(' ');
  if (!isRoot()) {
    throw new UserFacingError(`${why}. Install Debian's package, then run this again:\n\n    sudo apt-get install -y ${list}\n\n(run "sudo apt-get update" first if apt cannot find it)${alternative ? `, or ${alternative}` : ''}.`);
  }
  log(`${why}; installing Debian's package:`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!updated) {
    log('  apt-get update');
    await run('apt-get', ['update'], { env });
    updated = true;
  }
  log(`  apt-get install -y ${list}`);
  await run('apt-get', ['install', '-y', ...packages], { env });
}
