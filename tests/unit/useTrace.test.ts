import { describe, expect, it } from 'vitest';
import { nextTick, ref } from 'vue';
import { ApiError } from '@/api/http';
import { useTrace } from '@/composables/useTrace';

const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

describe('useTrace', () => {
  it('reads the trace for the key, and again when the key changes', async () => {
    const key = ref('A-1');
    const asked: string[] = [];
    const { trace, loading, error } = useTrace(
      () => key.value,
      async (k) => {
        asked.push(k);
        return { serial: k };
      },
      () => 'missing',
    );
    expect(loading.value).toBe(true);
    await settle();
    expect(trace.value).toEqual({ serial: 'A-1' });
    expect(loading.value).toBe(false);
    expect(error.value).toBe('');
    key.value = 'A-2';
    await nextTick();
    await settle();
    expect(asked).toEqual(['A-1', 'A-2']);
    expect(trace.value).toEqual({ serial: 'A-2' });
  });

  it('says "not found" in its own words for a 404 and passes other failures on', async () => {
    const missing = useTrace(
      () => 'X',
      () => Promise.reject(new ApiError(404, 'NOT_FOUND', 'nope')),
      (k) => `No driver has the serial "${k}".`,
    );
    await settle();
    expect(missing.trace.value).toBeNull();
    expect(missing.error.value).toBe('No driver has the serial "X".');
    const down = useTrace(
      () => 'X',
      () => Promise.reject(new ApiError(0, 'NETWORK', 'The server could not be reached.')),
      () => 'missing',
    );
    await settle();
    // The refusal's plain title, then the message (src/api/http.ts errorText).
    expect(down.error.value).toBe('The trace could not be read: Server not reachable. The server could not be reached.');
    expect(down.loading.value).toBe(false);
  });
});
