import type { ContainerStatus, LotStatus, StorageClass } from '@shared/constants';
import { CONTAINER_STATUS_WORDS as C, LOT_STATUS_WORDS as L, STORAGE_CLASS_WORDS, expiryCauseText, humanize } from '@shared/words';

/**
 * How statuses read on screen: always a word, with a colour and an icon beside it (never
 * colour alone). The words come from shared/words.ts (the one place for them); colours are
 * Quasar brand names from src/theme.ts.
 */
export interface StatusLook {
  label: string;
  color: string;
  icon: string;
  /** One sentence on what the status means in the plant. */
  hint: string;
  /** True when the look says "Expired" instead of the recorded status. */
  expired?: boolean;
}

export const LOT_STATUS_LOOK: Record<LotStatus, StatusLook> = {
  on_hold: { label: L.on_hold, color: 'warning', icon: 'pause_circle', hint: 'Waiting for incoming inspection; not to be used yet.' },
  released: { label: L.released, color: 'positive', icon: 'check_circle', hint: 'Inspected and free to use.' },
  quarantined: { label: L.quarantined, color: 'negative', icon: 'block', hint: 'Suspect: blocked at every station until quality decides.' },
  rejected: { label: L.rejected, color: 'negative', icon: 'cancel', hint: 'Refused by quality; never to be used.' },
  used_up: { label: L.used_up, color: 'grey-7', icon: 'inventory', hint: 'Every container is empty or scrapped.' },
};

export const CONTAINER_STATUS_LOOK: Record<ContainerStatus, StatusLook> = {
  sealed: { label: C.sealed, color: 'info', icon: 'lock', hint: 'Not opened yet.' },
  open: { label: C.open, color: 'primary', icon: 'lock_open', hint: 'In use; the after-opening life runs.' },
  empty: { label: C.empty, color: 'grey-7', icon: 'check_box_outline_blank', hint: 'Used up.' },
  scrapped: { label: C.scrapped, color: 'negative', icon: 'delete', hint: 'Thrown away (reason in the history).' },
};

export type StatusKind = 'lot' | 'container';

/**
 * Statuses under which a lot or container is still in stock and could be used: past its
 * effective expiry it reads "Expired" instead. Used up, rejected, empty and scrapped stay as they are.
 */
const IN_STOCK: Record<StatusKind, readonly string[]> = {
  lot: ['on_hold', 'released', 'quarantined'],
  container: ['sealed', 'open'],
};

export function statusLook(
  kind: StatusKind,
  status: string,
  expiry: { expiresAt?: string | null; cause?: string | null; nowMs?: number } = {},
): StatusLook {
  const table: Record<string, StatusLook> = kind === 'lot' ? LOT_STATUS_LOOK : CONTAINER_STATUS_LOOK;
  const base = table[status] ?? { label: humanize(status), color: 'grey-7', icon: 'help', hint: '' };
  const at = expiry.expiresAt ? Date.parse(expiry.expiresAt) : Number.NaN;
  if (Number.isNaN(at) || at > (expiry.nowMs ?? Date.now()) || !IN_STOCK[kind].includes(status)) return base;
  const cause = expiryCauseText(expiry.cause);
  return {
    label: cause ? `Expired (${cause})` : 'Expired',
    color: 'negative',
    icon: 'event_busy',
    hint: `Past its effective expiry${cause ? ` (set by the ${cause})` : ''}: not to be used. Recorded status: ${base.label.toLowerCase()}.`,
    expired: true,
  };
}

export { EXPIRY_CAUSE_TEXT, expiryCauseText } from '@shared/words';

const STORAGE_ICONS: Record<StorageClass, string> = { ambient: 'thermostat', refrigerated: 'kitchen', frozen: 'ac_unit' };

/** A storage class's word (shared/words.ts) and icon. */
export const STORAGE_CLASS_LOOK: Record<string, { label: string; icon: string }> = Object.fromEntries(
  Object.entries(STORAGE_CLASS_WORDS).map(([k, label]) => [k, { label, icon: STORAGE_ICONS[k as StorageClass] }]),
);
