import { afterEach, describe, expect, it } from 'vitest';
import { heapCapMb, serverCommand } from '../../scripts/lib/server-build';

describe('the server command of npm start', () => {
  const saved = process.env.TACKLOG_HEAP_MB;
  afterEach(() => {
    if (saved === undefined) delete process.env.TACKLOG_HEAP_MB;
    else process.env.TACKLOG_HEAP_MB = saved;
  });

  it('caps the old generation only when TACKLOG_HEAP_MB says so', () => {
    delete process.env.TACKLOG_HEAP_MB;
    expect(heapCapMb()).toBeNull();
    expect(serverCommand()[1].some((a) => a.startsWith('--max-old-space-size'))).toBe(false);
    process.env.TACKLOG_HEAP_MB = '512';
    expect(heapCapMb()).toBe(512);
    expect(serverCommand()[1]).toContain('--max-old-space-size=512');
  });

  it('refuses a cap that is not a sane whole number of megabytes, naming the variable', () => {
    for (const bad of ['12', '1.5', 'lots', '-200', '100000']) {
      process.env.TACKLOG_HEAP_MB = bad;
      expect(() => heapCapMb()).toThrow(/TACKLOG_HEAP_MB must be a whole number of megabytes/);
    }
  });
});
