import type { StationLoad } from '@shared/schemas/station-loads';
import { HOUR_MS, MINUTE_MS } from '@/composables/useCountdown';

/**
 * How early a loaded item's countdown turns to "soon" (amber) before it turns to "expired"
 * (red): a quarter of a mix's pot life, a fifth of an opened container's after-opening life
 * (at least 15 minutes either way), else a working shift (8 h).
 */
export function loadSoonMs(load: StationLoad): number {
  if (!load.expiresAt) return 0;
  const end = Date.parse(load.expiresAt);
  if (load.mix) {
    const span = end - Date.parse(load.mix.mixedAt);
    return Math.max(15 * MINUTE_MS, span / 4);
  }
  if (load.expiryCause === 'open_life' && load.container?.openedAt) {
    const span = end - Date.parse(load.container.openedAt);
    return Math.max(15 * MINUTE_MS, span / 5);
  }
  return 8 * HOUR_MS;
}

/** What the countdown counts down to, in words. */
export function loadLimitText(load: StationLoad): string {
  if (load.mix) return 'pot life';
  switch (load.expiryCause) {
    case 'open_life':
      return 'after-opening life';
    case 'shelf_life':
      return 'shelf life';
    case 'supplier_expiry':
      return "supplier's expiry";
    case 'thawed_life':
      return 'life after thawing';
    case 'out_of_storage':
      return 'time out of cold storage';
    case 'pot_life':
      return 'pot life';
    default:
      return 'expiry';
  }
}
