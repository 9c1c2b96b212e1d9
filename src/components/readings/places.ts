import type { Reading } from '@shared/schemas/readings';
import type { Station } from '@shared/schemas/stations';

/**
 * Where readings are taken: a shop area (its air), or a station with its own readings (an oven,
 * a UV lamp). The page's place filter and its charts use one list of these.
 */
export interface Place {
  /** 'area:Line A' or 'station:<id>': one value for the filter. */
  key: string;
  label: string;
  area?: string;
  stationId?: string;
}

export function areaPlace(area: string): Place {
  return { key: `area:${area}`, label: area, area };
}

export function stationPlace(s: Pick<Station, 'id' | 'code' | 'name'>): Place {
  return { key: `station:${s.id}`, label: `${s.name} (${s.code}, own readings)`, stationId: s.id };
}

/** The shop areas of the stations, then the stations that keep their own readings, each sorted by name. */
export function placesOf(stations: readonly Pick<Station, 'id' | 'code' | 'name' | 'area' | 'cureEnvironment'>[]): Place[] {
  const areas = [...new Set(stations.map((s) => s.area))].sort((a, b) => a.localeCompare(b)).map(areaPlace);
  const own = stations
    .filter((s) => s.cureEnvironment === 'own')
    .map(stationPlace)
    .sort((a, b) => a.label.localeCompare(b.label));
  return [...areas, ...own];
}

/** The list's filter for a place: {area} or {stationId}. */
export function placeFilter(place: Place | null): { area?: string; stationId?: string } {
  if (!place) return {};
  return place.area !== undefined ? { area: place.area } : { stationId: place.stationId };
}

/** Which place a reading belongs to. */
export function placeKeyOf(r: Pick<Reading, 'area' | 'stationId'>): string {
  return r.stationId ? `station:${r.stationId}` : `area:${r.area ?? ''}`;
}

/** The periods offered, in hours back from now. */
export const PERIODS = [
  { value: 24, label: '24 hours' },
  { value: 24 * 7, label: '7 days' },
  { value: 24 * 30, label: '30 days' },
] as const;
