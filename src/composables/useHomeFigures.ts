import { onBeforeUnmount, onMounted, ref, shallowRef } from 'vue';
import type { HomeFigures } from '@shared/schemas/home';
import type { Station } from '@shared/schemas/stations';
import { getHomeFigures } from '@/api/home';
import { errorText } from '@/api/http';
import { CURRENT_STATION_KEY, readStored } from '@/stores/station-storage';
import { alignWithServer } from './useNow';

/** The home page reads its figures again this often, and whenever the window comes back into view. */
export const HOME_REFRESH_MS = 60_000;
const RETURN_GAP_MS = 2_000;

/**
 * The home page's live figures: read on mount, every minute, and when the window gets the focus
 * or becomes visible again. A newer request replaces an older one (a late answer never
 * overwrites a newer one); a failed refresh keeps the last figures on screen and says so.
 */
export function useHomeFigures() {
  const figures = shallowRef<HomeFigures | null>(null);
  const loading = ref(false);
  const problem = ref('');
  let controller: AbortController | null = null;
  let timer: ReturnType<typeof setInterval> | undefined;
  let lastStart = 0;

  async function load(): Promise<void> {
    lastStart = Date.now();
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    loading.value = true;
    try {
      // The station this device is set to, as the station screen remembers it.
      const station = readStored<Pick<Station, 'id'>>(CURRENT_STATION_KEY);
      const next = await getHomeFigures({ stationId: station?.id ?? null }, mine.signal);
      if (controller !== mine) return;
      alignWithServer(next.now);
      figures.value = next;
      problem.value = '';
    } catch (err) {
      if (controller !== mine || (err instanceof DOMException && err.name === 'AbortError')) return;
      problem.value = `The figures could not be read${figures.value ? ' (those shown may be out of date)' : ''}: ${errorText(err)}`;
    } finally {
      if (controller === mine) {
        loading.value = false;
        controller = null;
      }
    }
  }

  /** Coming back to the window fires both focus and visibilitychange: one read is enough. */
  function onReturn() {
    if (document.visibilityState === 'visible' && Date.now() - lastStart > RETURN_GAP_MS) void load();
  }

  onMounted(() => {
    void load();
    timer = setInterval(() => void load(), HOME_REFRESH_MS);
    window.addEventListener('focus', onReturn);
    document.addEventListener('visibilitychange', onReturn);
  });
  onBeforeUnmount(() => {
    clearInterval(timer);
    controller?.abort();
    window.removeEventListener('focus', onReturn);
    document.removeEventListener('visibilitychange', onReturn);
  });

  return { figures, loading, problem, load };
}
