import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Loads server/config.ts in a fresh process with the given plant zone; returns its exit and output. */
function loadConfig(zone: string) {
  const result = spawnSync(
    path.join(root, 'node_modules', '.bin', 'tsx'),
    ['-e', "import('./server/config.ts').then((m) => console.log('zone=' + m.config.plantZone))"],
    { cwd: root, env: { ...process.env, TACKLOG_PLANT_ZONE: zone }, encoding: 'utf8' },
  );
  return { status: result.status, out: `${result.stdout}${result.stderr}` };
}

// Each case starts a process: give it the time a busy machine needs (not a speed check).
describe('TACKLOG_PLANT_ZONE is checked at start', { timeout: 60_000 }, () => {
  it('accepts an IANA zone', () => {
    const r = loadConfig('Europe/Berlin');
    expect(r.status).toBe(0);
    expect(r.out).toContain('zone=Europe/Berlin');
  });

  it('refuses an unknown zone, naming the variable', () => {
    const r = loadConfig('Europe/Atlantis');
    expect(r.status).not.toBe(0);
    expect(r.out).toMatch(/TACKLOG_PLANT_ZONE must be an IANA time zone .*"Europe\/Atlantis"/);
  });
});
