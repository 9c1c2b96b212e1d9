import { afterEach, describe, expect, it, vi } from 'vitest';
import { heapCapMb, serverCommand } from '../../scripts/lib/server-build';

describe('the server command of npm start', () => {
  afterEach(() => {
    vi.unstubAllEnvs();
  });

  it('caps the old generation only when TACKLOG_HEAP_MB says so', () => {
    vi.stubEnv('TACKLOG_HEAP_MB', undefined);
    expect(heapCapMb()).toBeNull();
    expect(serverCommand()[1].some((a) => a.startsWith('--max-old-space-size'))).toBe(false);
    vi.stubEnv('TACKLOG_HEAP_MB', '512');
    expect(heapCapMb()).toBe(512);
    expect(serverCommand()[1]).toContain('--max-old-space-size=512');
  });

  it('refuses a cap that is not a sane whole number of megabytes, naming the variable', () => {
    for (const bad of ['12', '1.5', 'lots', '-200', '100000']) {
      vi.stubEnv('TACKLOG_HEAP_MB', bad);
      expect(() => heapCapMb()).toThrow(/TACKLOG_HEAP_MB must be a whole number of megabytes/);
    }
  });
});
