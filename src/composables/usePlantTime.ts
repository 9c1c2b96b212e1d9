import {
  formatDate,
  formatDateTime,
  formatDuration,
  formatRelative,
  formatTime,
  formatWhen,
  plantGreeting,
  type InstantLike,
} from '@shared/plant-time';
import { usePlantStore } from '@/stores/plant';
import { useNow } from './useNow';

/**
 * The shared plant-time formatter bound to the plant's zone (from the server) and the one
 * client clock. Reading any of these in a template re-renders when the clock ticks or the zone
 * arrives. Empty input gives '' so optional times need no guard in templates.
 */
export function usePlantTime() {
  const plant = usePlantStore();
  const { now, refresh } = useNow();
  const guard =
    (fn: (v: InstantLike) => string) =>
    (value: InstantLike | null | undefined): string =>
      value === null || value === undefined || value === '' ? '' : fn(value);
  return {
    now,
    refresh,
    /** "07:25" today, "Thu 07:25" within six days, else "2026-12-10 07:25" (plant days). */
    time: guard((v) => formatTime(v, plant.zone, now.value)),
    /** "2026-12-02" */
    date: guard((v) => formatDate(v, plant.zone)),
    /** "2026-12-02 07:25" */
    dateTime: guard((v) => formatDateTime(v, plant.zone)),
    /** "in 3 h 20 min" / "3 h 20 min ago" */
    relative: guard((v) => formatRelative(v, now.value)),
    /** "Thu 07:25, in 27 h 10 min" */
    when: guard((v) => formatWhen(v, plant.zone, now.value)),
    duration: formatDuration,
    greeting: () => plantGreeting(plant.zone, now.value),
    zone: () => plant.zone,
  };
}

export type PlantTime = ReturnType<typeof usePlantTime>;
