/**
 * The station screen remembers its station, the station list, the current traveler and its
 * queue on this device (localStorage), so it comes back after a reload or without a network.
 */
/** Where the station screen keeps the station this device is set to (the home page reads it too). */
export const CURRENT_STATION_KEY = 'tacklog.station.current';

function storage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    // Storage can be switched off by the browser's privacy settings: then nothing is remembered.
    return null;
  }
}

export function readStored<T>(key: string): T | null {
  const text = storage()?.getItem(key);
  if (!text) return null;
  try {
    return JSON.parse(text) as T;
  } catch (err) {
    console.error(`[station] stored "${key}" is unreadable; ignoring it`, err);
    return null;
  }
}

export function writeStored(key: string, value: unknown): void {
  const s = storage();
  if (!s) return;
  if (value === null || value === undefined) s.removeItem(key);
  else s.setItem(key, JSON.stringify(value));
}
