import type { Role } from '@shared/constants';
import { rolesAllow } from './roles';

/**
 * The drawer's navigation, in one place. An item shows only when its route name is registered
 * in the router, so an area appears as soon as its routes are added (src/router/routes/).
 * Register the area's main route under the `to` name given here (or edit the item).
 */
export type NavGroupId = 'start' | 'floor' | 'oversight' | 'catalogue' | 'admin';

export interface NavGroup {
  id: NavGroupId;
  label: string;
}

export interface NavItem {
  /** Route name. */
  to: string;
  label: string;
  /** Material icon name (bundled from @quasar/extras). */
  icon: string;
  group: NavGroupId;
  /** Who sees it; absent = everyone signed in. */
  roles?: readonly Role[];
}

export const NAV_GROUPS: readonly NavGroup[] = [
  { id: 'start', label: '' },
  { id: 'floor', label: 'On the floor' },
  { id: 'oversight', label: 'Oversight' },
  { id: 'catalogue', label: 'Catalogue' },
  { id: 'admin', label: 'Administration' },
];

export const NAV_ITEMS: readonly NavItem[] = [
  { to: 'home', label: 'Home', icon: 'home', group: 'start' },

  { to: 'receiving.new', label: 'Receiving', icon: 'move_to_inbox', group: 'floor', roles: ['receiving', 'admin'] },
  { to: 'labels.print', label: 'Labels', icon: 'qr_code_2', group: 'floor', roles: ['receiving', 'quality', 'admin'] },
  { to: 'scan.lookup', label: 'Scan a code', icon: 'qr_code_scanner', group: 'floor' },
  { to: 'station.work', label: 'Station', icon: 'precision_manufacturing', group: 'floor', roles: ['assembler'] },
  { to: 'batches.list', label: 'Batches', icon: 'layers', group: 'floor', roles: ['assembler', 'quality'] },
  { to: 'cure.board', label: 'Cure board', icon: 'timer', group: 'floor', roles: ['assembler', 'quality'] },
  { to: 'tests.final', label: 'Final test', icon: 'fact_check', group: 'floor', roles: ['assembler', 'quality'] },
  { to: 'readings.list', label: 'Shop conditions', icon: 'device_thermostat', group: 'floor', roles: ['assembler', 'quality', 'admin'] },

  { to: 'lots.list', label: 'Lots', icon: 'inventory_2', group: 'oversight' },
  { to: 'trace.search', label: 'Trace', icon: 'account_tree', group: 'oversight', roles: ['quality'] },
  { to: 'alerts.list', label: 'Alerts', icon: 'notifications', group: 'oversight', roles: ['quality', 'admin', 'purchasing'] },
  { to: 'mail.box', label: 'Mailbox', icon: 'mail', group: 'oversight' },
  { to: 'stock.overview', label: 'Stock & expiry', icon: 'event_busy', group: 'oversight', roles: ['purchasing'] },

  { to: 'catalogue.materials', label: 'Materials', icon: 'science', group: 'catalogue', roles: ['admin'] },
  { to: 'catalogue.suppliers', label: 'Suppliers', icon: 'local_shipping', group: 'catalogue', roles: ['admin', 'purchasing'] },
  { to: 'catalogue.stations', label: 'Stations', icon: 'place', group: 'catalogue', roles: ['admin'] },
  { to: 'catalogue.models', label: 'Driver models', icon: 'speaker', group: 'catalogue', roles: ['admin'] },

  { to: 'users.list', label: 'Users', icon: 'manage_accounts', group: 'admin', roles: ['admin'] },
];

/** The items a user with `roles` may see, among those whose route exists. */
export function visibleNavItems(
  roles: readonly Role[],
  routeExists: (name: string) => boolean,
  items: readonly NavItem[] = NAV_ITEMS,
): NavItem[] {
  return items.filter((item) => routeExists(item.to) && rolesAllow(item.roles, roles));
}

/** Visible items grouped for the drawer, empty groups left out. */
export function groupNavItems(items: readonly NavItem[]): { group: NavGroup; items: NavItem[] }[] {
  return NAV_GROUPS.map((group) => ({ group, items: items.filter((item) => item.group === group.id) })).filter(
    (entry) => entry.items.length > 0,
  );
}
