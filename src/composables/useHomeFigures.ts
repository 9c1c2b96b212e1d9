import { onBeforeUnmount, onMounted, ref, shallowRef } from 'vue';
import type { HomeFigures } from '@shared/schemas/home';
import type { Station } from '@shared/schemas/stations';
import { getHomeFigures } from '@/api/home';
import { errorText } from '@/api/http';
import { CURRENT_STATION_KEY, readStored } from '@/stores/station-storage';
import { alignWithServer } from './useNow';

/** The home page reads its figures again this often, and whenever the window comes back into view. */
export const HOME_REFRESH_MS = 60_000;
/** Coming back to the window fires both focus and visibilitychange: one read within this gap is enough. */
const RETURN_GAP_MS = 2_000;

type Fetcher = (query: { stationId?: string | null }, signal: AbortSignal) => Promise<HomeFigures>;

/** What the figures listen to for "the person is back": the window (focus) and the document (visibility). */
export interface ReturnSignals {
  window: Pick<Window, 'addEventListener' | 'removeEventListener'>;
  document: Pick<Document, 'addEventListener' | 'removeEventListener' | 'visibilityState'>;
}

/**
 * The home page's live figures: `start()` reads them, then every minute and whenever the window
 * gets the focus or becomes visible again; `stop()` ends that. A newer request replaces an older
 * one (a late answer never overwrites a newer one); a failed refresh keeps the last figures on
 * screen and says so.
 */
export function createHomeFigures(fetcher: Fetcher = getHomeFigures, signals?: ReturnSignals, clock: () => number = Date.now) {
  const figures = shallowRef<HomeFigures | null>(null);
  const loading = ref(false);
  const problem = ref('');
  let controller: AbortController | null = null;
  let timer: ReturnType<typeof setInterval> | undefined;
  let lastStart = Number.NEGATIVE_INFINITY;

  async function load(): Promise<void> {
    lastStart = clock();
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    loading.value = true;
    try {
      // The station this device is set to, as the station screen remembers it.
      const station = readStored<Pick<Station, 'id'>>(CURRENT_STATION_KEY);
      const next = await fetcher({ stationId: station?.id ?? null }, mine.signal);
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

  function onReturn() {
    if (signals?.document.visibilityState === 'visible' && clock() - lastStart > RETURN_GAP_MS) void load();
  }

  function start() {
    void load();
    timer = setInterval(() => void load(), HOME_REFRESH_MS);
    signals?.window.addEventListener('focus', onReturn);
    signals?.document.addEventListener('visibilitychange', onReturn);
  }

  function stop() {
    clearInterval(timer);
    controller?.abort();
    signals?.window.removeEventListener('focus', onReturn);
    signals?.document.removeEventListener('visibilitychange', onReturn);
  }

  return { figures, loading, problem, load, start, stop };
}

/** The home page's figures, read while the page is shown (see createHomeFigures). */
export function useHomeFigures() {
  const home = createHomeFigures(getHomeFigures, { window, document });
  onMounted(home.start);
  onBeforeUnmount(home.stop);
  return home;
}
