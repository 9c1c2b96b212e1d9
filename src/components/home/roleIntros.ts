import type { Role } from '@shared/constants';
import { can } from '@shared/permissions';
import { NAV_ITEMS, type NavItem } from '@/navigation';
import { actionsOf } from '@/router/meta';

/** What each role does in Tacklog, shown on the home page. */
export const ROLE_INTROS: Record<Role, { summary: string; icon: string }> = {
  receiving: {
    icon: 'move_to_inbox',
    summary:
      'Record each incoming lot with its supplier lot number, dates and certificate, print a QR label for every ' +
      "container and put it away in the right storage. Scanning a supplier's barcode fills in lot and dates.",
  },
  assembler: {
    icon: 'precision_manufacturing',
    summary:
      'Scan the station, the build batch and every container you load. Tacklog accepts or refuses at once and says ' +
      'why, and keeps the pot-life and cure clocks for you.',
  },
  quality: {
    icon: 'verified',
    summary:
      'Release, reject or quarantine lots; trace a driver back to its lots and a lot forward to its drivers; watch ' +
      'failure rates by lot, alerts and deviations.',
  },
  purchasing: {
    icon: 'event_busy',
    summary:
      'See what expires when, stock on hand against consumption and days of cover, what will expire before it can ' +
      'be used, and what to reorder.',
  },
  admin: {
    icon: 'manage_accounts',
    summary: 'Keep users and their roles, the material catalogue, suppliers, stations, and driver models with their ' + 'process steps.',
  },
};

/**
 * The areas a role works in (its own items plus those open to everyone), home excluded: the
 * permission map says which actions the role has, for describing the role on the home page.
 */
export function areasForRole(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.to !== 'home' && (!item.permission || actionsOf(item.permission).some((a) => can([role], a))));
}
