/**
 * Who hears of which alert by e-mail. Each alert kind has the roles it concerns (the widest
 * audience the compliance watch gives it) and whether it can be critical. A user may choose,
 * per kind, "at once" (one e-mail per new alert), "in the daily digest" or "no e-mail".
 * Defaults by role: kinds that can be critical and concern one of the user's roles come at
 * once; the other kinds that concern them come in the digest; the rest not at all.
 * Pure: used by the server (recipients, settings) and the client (settings page).
 */
import { ALERT_KINDS, type AlertKind, type Role } from './constants';
import { alertKindWords as wordsOfKind } from './words';

export const NOTIFICATION_MODES = ['immediate', 'digest', 'none'] as const;
export type NotificationMode = (typeof NOTIFICATION_MODES)[number];

export const MODE_WORDS: Record<NotificationMode, string> = {
  immediate: 'At once',
  digest: 'In the daily digest',
  none: 'No e-mail',
};

export interface AlertKindInfo {
  /** The kind in plain words, for subjects and pages. */
  words: string;
  /** Roles the kind concerns (the widest audience the watch gives it). */
  audience: readonly Role[];
  /** Whether alerts of this kind can be critical (some always are, some only in some cases). */
  canBeCritical: boolean;
  /** Its remedy means handling or discarding material that may be a hazardous chemical. */
  handling: boolean;
  /** What the person should do, in one sentence. */
  todo: string;
}

export const ALERT_KIND_INFO: Record<AlertKind, AlertKindInfo> = {
  pot_life_exceeded: {
    words: 'Pot life passed',
    audience: ['assembler', 'quality'],
    canBeCritical: true,
    handling: true,
    todo: 'Unload the mix from the station and discard it as its SDS says; check the drivers glued with it after the pot life ended.',
  },
  short_cure: {
    words: 'Next step before cure was complete',
    audience: ['quality'],
    canBeCritical: true,
    handling: false,
    todo: 'Review the batch: decide whether its drivers need extra checks, and record a deviation if one is missing.',
  },
  expired_in_stock: {
    words: 'Expired material in stock',
    audience: ['quality', 'receiving', 'assembler'],
    canBeCritical: true,
    handling: true,
    todo: 'Take the container out of use: unload it if it is at a station, then scrap it or ask quality for a decision.',
  },
  expiring_soon: {
    words: 'Lot expiring soon',
    audience: ['purchasing', 'quality'],
    canBeCritical: false,
    handling: false,
    todo: 'Use this lot first, or plan its disposal before it expires.',
  },
  quarantine_advised: {
    words: 'Quarantine advised',
    audience: ['quality'],
    canBeCritical: false,
    handling: false,
    todo: 'Decide whether to quarantine the lot, and trace the drivers built with it.',
  },
  below_reorder_point: {
    words: 'Below reorder point',
    audience: ['purchasing'],
    canBeCritical: false,
    handling: false,
    todo: 'Check the stock and order more if it is still needed.',
  },
  audit_chain_broken: {
    words: 'Audit trail does not verify',
    audience: ['quality', 'admin'],
    canBeCritical: true,
    handling: false,
    todo: 'Find out who changed the database directly; keep a copy of it before anything else changes, and run the audit verification again.',
  },
  lamp_check_due: {
    words: 'UV lamp radiometer check due',
    audience: ['quality'],
    canBeCritical: false,
    handling: false,
    todo: 'Measure the lamp with the radiometer and record the reading for its station; the UV dose of each step is computed from it.',
  },
  humidity_out_of_window: {
    words: 'Cured outside its humidity range',
    audience: ['quality'],
    canBeCritical: false,
    handling: false,
    todo: "Review the batch: the adhesive cured while the area's humidity was outside its data sheet range; decide whether its drivers need extra checks.",
  },
};

export function isAlertKind(kind: string): kind is AlertKind {
  return (ALERT_KINDS as readonly string[]).includes(kind);
}

/** A kind in plain words; an unknown kind reads as its words ("new_kind" → "New kind"). */
export function alertKindWords(kind: string): string {
  return wordsOfKind(kind);
}

/**
 * The kinds a user can be told about: an administrator sees every alert, others the kinds
 * that concern one of their roles.
 */
export function kindsFor(roles: readonly Role[]): AlertKind[] {
  if (roles.includes('admin')) return [...ALERT_KINDS];
  return ALERT_KINDS.filter((k) => ALERT_KIND_INFO[k].audience.some((r) => roles.includes(r)));
}

/** The default mode of one kind for these roles (see the file comment). */
export function defaultMode(kind: AlertKind, roles: readonly Role[]): NotificationMode {
  const info = ALERT_KIND_INFO[kind];
  if (!info.audience.some((r) => roles.includes(r))) return 'none';
  return info.canBeCritical ? 'immediate' : 'digest';
}

/** Every kind with its default mode for these roles. */
export function defaultModes(roles: readonly Role[]): Record<AlertKind, NotificationMode> {
  return Object.fromEntries(ALERT_KINDS.map((k) => [k, defaultMode(k, roles)])) as Record<AlertKind, NotificationMode>;
}

/** The modes in effect: the user's choices over the defaults of their roles. */
export function effectiveModes(
  roles: readonly Role[],
  chosen: Partial<Record<string, NotificationMode>>,
): Record<AlertKind, NotificationMode> {
  const modes = defaultModes(roles);
  for (const k of ALERT_KINDS) {
    const c = chosen[k];
    if (c) modes[k] = c;
  }
  return modes;
}
