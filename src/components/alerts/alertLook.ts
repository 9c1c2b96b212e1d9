import type { AlertKind, AlertSeverity, AlertState } from '@shared/constants';
import type { Alert } from '@shared/schemas/alerts';
import {
  ALERT_KIND_WORDS,
  ALERT_SEVERITY_WORDS as SEV,
  ALERT_STATE_WORDS as ST,
  alertKindWords,
  alertSeverityWords,
  alertStateWords,
} from '@shared/words';
import { formatDateTime, formatRelative } from '@shared/plant-time';

/**
 * How alerts read on screen: severity and state always as a word with an icon and a colour
 * (never colour alone), kinds in plain words, and where each alert's subject can be opened.
 * Colours are Quasar brand names from src/theme.ts.
 */
export interface AlertLook {
  label: string;
  color: string;
  icon: string;
  hint: string;
}

export const SEVERITY_LOOK: Record<AlertSeverity, AlertLook> = {
  critical: { label: SEV.critical, color: 'negative', icon: 'error', hint: 'Act now: material or drivers at risk on the line.' },
  warning: { label: SEV.warning, color: 'warning', icon: 'warning_amber', hint: 'Needs a decision soon.' },
  info: { label: SEV.info, color: 'info', icon: 'info', hint: 'For planning; nothing is at risk yet.' },
};

export const STATE_LOOK: Record<AlertState, AlertLook> = {
  open: { label: ST.open, color: 'primary', icon: 'radio_button_unchecked', hint: 'Nobody has taken it up yet.' },
  acknowledged: { label: ST.acknowledged, color: 'secondary', icon: 'visibility', hint: 'Someone has seen it and is on it.' },
  resolved: { label: ST.resolved, color: 'positive', icon: 'task_alt', hint: 'Done: what was done is recorded.' },
};

/** Alert kinds in plain words (shared/words.ts). */
export const KIND_WORDS: Record<AlertKind, string> = ALERT_KIND_WORDS;

export function severityLook(severity: string): AlertLook {
  return SEVERITY_LOOK[severity as AlertSeverity] ?? { label: alertSeverityWords(severity), color: 'grey-7', icon: 'help', hint: '' };
}

export function stateLook(state: string): AlertLook {
  return STATE_LOOK[state as AlertState] ?? { label: alertStateWords(state), color: 'grey-7', icon: 'help', hint: '' };
}

/** A kind in plain words; an unknown kind reads as its words ("new_kind" → "New kind"). */
export const kindWords = (kind: string): string => alertKindWords(kind);

export interface SubjectRoute {
  name: string;
  params?: Record<string, string>;
  query?: Record<string, string>;
}

/**
 * Where an alert's subject can be opened. `links` are named routes to try in order (the page
 * shows the first whose route exists and that the user may open); `batchCode` is a batch to
 * look up by its code (the alert knows the code, not the batch id). `label` names the subject.
 */
export interface AlertSubject {
  label: string;
  links: { label: string; to: SubjectRoute }[];
  batchCode?: string;
}

function text(value: unknown): string | undefined {
  return typeof value === 'string' && value !== '' ? value : undefined;
}

export function alertSubject(alert: Pick<Alert, 'subjectType' | 'subjectId' | 'data'>): AlertSubject {
  const data = alert.data ?? {};
  switch (alert.subjectType) {
    case 'lot':
      return { label: 'Lot', links: [{ label: 'Open the lot', to: { name: 'lots.detail', params: { id: alert.subjectId } } }] };
    case 'container': {
      const code = text(data.containerCode);
      const lotId = text(data.lotId);
      const label = code ? `Container ${code}` : 'Container';
      return { label, links: lotId ? [{ label: 'Open its lot', to: { name: 'lots.detail', params: { id: lotId } } }] : [] };
    }
    case 'material':
      return {
        label: 'Material',
        links: [
          { label: 'Open the material', to: { name: 'catalogue.materials.edit', params: { id: alert.subjectId } } },
          { label: 'Lots of this material', to: { name: 'lots.list', query: { materialId: alert.subjectId } } },
        ],
      };
    case 'step_run': {
      const batchCode = text(data.batchCode);
      return { label: batchCode ? `Batch ${batchCode}` : 'Batch step', links: [], batchCode };
    }
    case 'mix': {
      const mix = text(data.mixCode);
      const station = text(data.station);
      return { label: [mix ? `Mix ${mix}` : 'Mix', station ? `at ${station}` : ''].filter(Boolean).join(' '), links: [] };
    }
    default:
      return { label: kindWords(alert.subjectType), links: [] };
  }
}

/** When something happened, relative to `now` ("3 h 20 min ago") and in full in plant time ("2026-12-02 07:25"). */
export function whenText(iso: string, zone: string, now: number | Date = Date.now()): { relative: string; absolute: string } {
  return { relative: formatRelative(iso, now), absolute: formatDateTime(iso, zone) };
}

/**
 * Who took an alert up and when: "Acknowledged by Dana Quill, 2026-12-02 07:25"; a resolution
 * without a person was the compliance watch clearing it.
 */
export function handledText(
  alert: Pick<Alert, 'acknowledgedAt' | 'acknowledgedByName' | 'resolvedAt' | 'resolvedBy' | 'resolvedByName'>,
  zone: string,
): { acknowledged: string | null; resolved: string | null } {
  const by = (name: string | null) => (name ? ` by ${name}` : '');
  return {
    acknowledged: alert.acknowledgedAt
      ? `Acknowledged${by(alert.acknowledgedByName)}, ${formatDateTime(alert.acknowledgedAt, zone)}`
      : null,
    resolved: alert.resolvedAt
      ? `Resolved${alert.resolvedBy ? by(alert.resolvedByName) : ' by the compliance watch'}, ${formatDateTime(alert.resolvedAt, zone)}`
      : null,
  };
}

/** Kinds whose remedy means handling or discarding material that may be a hazardous chemical. */
export const HANDLING_KINDS: ReadonlySet<string> = new Set(['pot_life_exceeded', 'expired_in_stock']);
