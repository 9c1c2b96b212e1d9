import { ref, watch, type Ref } from 'vue';
import { ApiError, errorText } from '@/api/http';

/**
 * Reads one trace (a driver's or a lot's) whenever its key changes: the trace, whether it is
 * loading, and an error sentence (`notFound` for a 404, the server's message otherwise).
 */
export function useTrace<T>(key: () => string, read: (key: string) => Promise<T>, notFound: (key: string) => string) {
  const trace: Ref<T | null> = ref(null);
  const loading = ref(false);
  const error = ref('');

  async function load(k: string) {
    loading.value = true;
    error.value = '';
    trace.value = null;
    try {
      trace.value = await read(k);
    } catch (err) {
      error.value = err instanceof ApiError && err.status === 404 ? notFound(k) : `The trace could not be read: ${errorText(err)}`;
    } finally {
      loading.value = false;
    }
  }

  watch(key, (k) => void load(k), { immediate: true });
  return { trace, loading, error };
}
