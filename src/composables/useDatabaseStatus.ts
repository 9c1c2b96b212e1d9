import { computed, onScopeDispose, watch } from 'vue';
import { connection } from '@/api/connection';
import { fetchHealth } from '@/api/health';

/**
 * The database's reachability for the banner. While it is down, asks /api/health every
 * Retry-After seconds, so the banner goes away by itself when the database is back even if no
 * page is waiting on a request; pages' own reads wait and retry in apiFetch meanwhile.
 */
export function useDatabaseStatus() {
  let timer: ReturnType<typeof setTimeout> | null = null;
  let controller: AbortController | null = null;

  const stop = () => {
    if (timer) clearTimeout(timer);
    timer = null;
    controller?.abort();
    controller = null;
  };

  const schedule = () => {
    stop();
    timer = setTimeout(async () => {
      controller = new AbortController();
      try {
        await fetchHealth(controller.signal); // a 200 reports the database up
      } catch {
        // still down (or the server itself unreachable): ask again
      }
      if (connection.databaseDown) schedule();
    }, connection.retryAfterMs);
  };

  watch(
    () => connection.databaseDown,
    (down) => (down ? schedule() : stop()),
    { immediate: true },
  );
  onScopeDispose(stop);

  return { databaseDown: computed(() => connection.databaseDown) };
}
