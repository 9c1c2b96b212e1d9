import { computed, readonly, ref } from 'vue';
import { defineStore } from 'pinia';
import * as plantApi from '@/api/plant';

/**
 * The plant as the server describes it: its time zone (every time on screen is shown in it,
 * never in the browser's zone) and its name. Loaded once at start; one request in flight.
 * Until it is known, `zone` is UTC and `known` is false.
 */
export const usePlantStore = defineStore('plant', () => {
  const zone = ref('UTC');
  const name = ref('Tacklog');
  const known = ref(false);
  /** Shortest password accepted (for hints on password forms; the server checks). */
  const minPasswordLength = ref(12);
  let inFlight: Promise<void> | null = null;

  /** Asks the server once; a later call after success does nothing, after a failure asks again. */
  function ensureLoaded(): Promise<void> {
    if (known.value) return Promise.resolve();
    if (inFlight) return inFlight;
    inFlight = plantApi
      .getPlantConfig()
      .then((config) => {
        zone.value = config.plantZone;
        name.value = config.plantName;
        if (config.minPasswordLength) minPasswordLength.value = config.minPasswordLength;
        known.value = true;
      })
      .finally(() => {
        inFlight = null;
      });
    return inFlight;
  }

  return {
    zone: readonly(zone),
    name: readonly(name),
    minPasswordLength: readonly(minPasswordLength),
    known: computed(() => known.value),
    ensureLoaded,
  };
});
