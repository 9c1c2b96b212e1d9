import { refusalTitle, type RefusalCode } from '@shared/refusals';
import type { ApiError } from '@/api/http';

/**
 * What the station screen shows after every scan or action: a big accept / refuse / queued
 * panel with a headline in plain words (the refusal catalogue's title) and the server's reason
 * text. The reason code rides along for scripts and tests only. Kept apart from the store so
 * the wording is in one place.
 */
export type FeedbackKind = 'accept' | 'refuse' | 'queued' | 'info';

export interface StationFeedback {
  id: number;
  kind: FeedbackKind;
  title: string;
  message: string;
  /** The reason code (WRONG_MATERIAL, LOT_ON_HOLD …, or a local one: OFFLINE …) for scripts and tests; never shown. */
  code: RefusalCode | null;
  at: string;
}

let nextId = 1;

export function feedback(
  kind: FeedbackKind,
  title: string,
  message: string,
  code: RefusalCode | null = null,
  at = new Date(),
): StationFeedback {
  return { id: nextId++, kind, title, message, code, at: at.toISOString() };
}

/** "Refused: lot on hold": the catalogue's plain title as the headline; the server's message says the details. */
export function refusalHeadline(code: RefusalCode | null, what: string): string {
  if (!code || code === 'HTTP_ERROR') return `Refused: ${what}`;
  const title = refusalTitle(code);
  // Lower-case the first letter unless the title starts with an abbreviation (GTIN …).
  const lead = /^[A-Z][a-z]/.test(title) ? title.charAt(0).toLowerCase() + title.slice(1) : title;
  return `Refused: ${lead}`;
}

export function refusalFeedback(error: ApiError, what: string): StationFeedback {
  return feedback('refuse', refusalHeadline(error.code, what), error.message, error.code);
}

export function queuedFeedback(label: string): StationFeedback {
  return feedback(
    'queued',
    'Offline: queued',
    `${label} is kept on this device and will be checked and sent when the network is back. Do not use the material until it is accepted.`,
    'OFFLINE',
  );
}
