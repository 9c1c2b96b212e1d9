import type { ApiError } from '@/api/http';

/**
 * What the station screen shows after every scan or action: a big accept / refuse / queued
 * panel with the server's reason text and its reason code. Kept apart from the store so the
 * wording is in one place.
 */
export type FeedbackKind = 'accept' | 'refuse' | 'queued' | 'info';

export interface StationFeedback {
  id: number;
  kind: FeedbackKind;
  title: string;
  message: string;
  /** The server's reason code (WRONG_MATERIAL, LOT_ON_HOLD …) or a local one (OFFLINE …). */
  code: string | null;
  at: string;
}

let nextId = 1;

export function feedback(kind: FeedbackKind, title: string, message: string, code: string | null = null, at = new Date()): StationFeedback {
  return { id: nextId++, kind, title, message, code, at: at.toISOString() };
}

/** Headline for a refusal, by reason code; the server's own message says the details. */
const REFUSAL_TITLES: Record<string, string> = {
  WRONG_MATERIAL: 'Refused: wrong material',
  WRONG_STATION: 'Refused: not this station',
  LOT_ON_HOLD: 'Refused: lot on hold',
  LOT_QUARANTINED: 'Refused: lot quarantined',
  LOT_REJECTED: 'Refused: lot rejected',
  EXPIRED: 'Refused: expired',
  OPEN_LIFE_EXCEEDED: 'Refused: after-opening life over',
  POT_LIFE_EXCEEDED: 'Refused: pot life over',
  CONTAINER_EMPTY: 'Refused: container empty',
  CONTAINER_SCRAPPED: 'Refused: container scrapped',
  STATION_RETIRED: 'Refused: station retired',
  BATCH_CLOSED: 'Refused: batch closed',
  MIX_DISCARDED: 'Refused: mix discarded',
  CURE_INCOMPLETE: 'Refused: cure not complete',
  MATERIAL_NOT_LOADED: 'Refused: material not loaded',
  INSUFFICIENT_STOCK: 'Refused: not enough loaded',
  STEP_NOT_STARTED: 'Refused: step not started',
  STEP_ALREADY_STARTED: 'Refused: step already running',
  STEP_ALREADY_DONE: 'Refused: step already done',
  STEP_OUT_OF_ORDER: 'Refused: an earlier step is not finished',
  WRONG_BATCH: 'Refused: wrong batch',
  NOT_FOUND: 'Refused: unknown code',
  VALIDATION_FAILED: 'Refused: check the input',
  FORBIDDEN: 'Refused: not allowed for your role',
};

export function refusalFeedback(error: ApiError, what: string): StationFeedback {
  const title = REFUSAL_TITLES[error.code] ?? `Refused: ${what}`;
  return feedback('refuse', title, error.message, error.code);
}

export function queuedFeedback(label: string): StationFeedback {
  return feedback(
    'queued',
    'Offline: queued',
    `${label} is kept on this device and will be checked and sent when the network is back. Do not use the material until it is accepted.`,
    'OFFLINE',
  );
}
