import type { BatchDetail, TravelerStep } from '@shared/schemas/batches';
import type { Station } from '@shared/schemas/stations';

/**
 * What a scan at the station means, decided in the browser so it works offline too:
 * a station's code (from the cached list), a build batch's code (<model>-<yyMMdd>-<nn>),
 * a mix's code (MX-… or M-…), or else a container's code. The server checks everything again.
 */
export type ScanMeaning =
  | { type: 'station'; station: Station }
  | { type: 'batch'; code: string }
  | { type: 'mix'; code: string }
  | { type: 'container'; code: string };

/** Batch codes are <model code>-<yyMMdd>-<seq of the day> (shared/schemas/batches.ts). */
export const BATCH_CODE_RE = /^[A-Za-z0-9][A-Za-z0-9_-]*-\d{6}-\d{2,}$/;
/** Mix codes: MX-<yyMMdd>-<seq> (shared/schemas/mixes.ts); the demo's older mixes use M-<8 symbols>. */
export const MIX_CODE_RE = /^MX?-[A-Za-z0-9-]+$/i;

export function findStationByCode(stations: readonly Station[], code: string): Station | undefined {
  const wanted = code.trim().toUpperCase();
  return stations.find((s) => s.code.toUpperCase() === wanted);
}

export function interpretScan(code: string, stations: readonly Station[], hasBatch: boolean): ScanMeaning {
  const trimmed = code.trim();
  const station = findStationByCode(stations, trimmed);
  if (station) return { type: 'station', station };
  if (!hasBatch || BATCH_CODE_RE.test(trimmed)) return { type: 'batch', code: trimmed };
  if (MIX_CODE_RE.test(trimmed)) return { type: 'mix', code: trimmed };
  return { type: 'container', code: trimmed };
}

/**
 * The batch's step that runs at a station of this kind: the first one not yet finished
 * (the server picks the same one when loading).
 */
export function stepAtStation(traveler: BatchDetail | null, stationKind: string | undefined): TravelerStep | null {
  if (!traveler || !stationKind) return null;
  return traveler.steps.find((s) => s.stationKind === stationKind && (s.state === 'pending' || s.state === 'running')) ?? null;
}

/** The step before `step` that must have cured first (waitForCure), with its cure times. */
export function cureGateBefore(traveler: BatchDetail | null, step: TravelerStep | null): TravelerStep | null {
  if (!traveler || !step) return null;
  const before = traveler.steps.filter((s) => s.seq < step.seq).sort((a, b) => b.seq - a.seq)[0];
  return before && before.waitForCure ? before : null;
}
