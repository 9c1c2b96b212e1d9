import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import type { Station, StationInput, StationPatch } from '@shared/schemas/stations';
import * as stationsApi from '@/api/stations';

/** Stations for the set-up pages, keyed by id (retired ones included). Pages show notifications. */
export const useStationsStore = defineStore('stations', () => {
  const byId = ref<Record<string, Station>>({});
  const loaded = ref(false);
  let inFlight: Promise<Station[]> | null = null;

  const all = computed(() => Object.values(byId.value).sort((a, b) => a.code.localeCompare(b.code)));
  const active = computed(() => all.value.filter((s) => s.active));
  /** The station kinds in use, for recipe steps. */
  const kinds = computed(() => [...new Set(all.value.map((s) => s.kind))].sort());
  const areas = computed(() => [...new Set(all.value.map((s) => s.area))].sort());

  function put(station: Station): Station {
    byId.value = { ...byId.value, [station.id]: station };
    return station;
  }

  function load(force = false): Promise<Station[]> {
    if (loaded.value && !force) return Promise.resolve(all.value);
    if (!inFlight) {
      inFlight = stationsApi
        .listStations({ includeRetired: true })
        .then((items) => {
          byId.value = Object.fromEntries(items.map((s) => [s.id, s]));
          loaded.value = true;
          return all.value;
        })
        .finally(() => {
          inFlight = null;
        });
    }
    return inFlight;
  }

  return {
    all,
    active,
    kinds,
    areas,
    loaded: computed(() => loaded.value),
    load,
    create: async (input: StationInput) => put(await stationsApi.createStation(input)),
    update: async (id: string, patch: StationPatch) => put(await stationsApi.updateStation(id, patch)),
    retire: async (id: string) => put(await stationsApi.retireStation(id)),
  };
});
