import type { Action } from '@shared/permissions';
import { actionsOf, type PermissionNeed } from './router/meta';

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
  /** The action (or any of the actions) the area is for; absent = everyone signed in. */
  permission?: PermissionNeed;
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

  { to: 'receiving.new', label: 'Receiving', icon: 'move_to_inbox', group: 'floor', permission: 'lots.receive' },
  { to: 'labels.print', label: 'Labels', icon: 'qr_code_2', group: 'floor', permission: 'labels.print' },
  { to: 'scan.lookup', label: 'Scan a code', icon: 'qr_code_scanner', group: 'floor' },
  { to: 'station.work', label: 'Station', icon: 'precision_manufacturing', group: 'floor', permission: 'steps.run' },
  { to: 'batches.list', label: 'Batches', icon: 'layers', group: 'floor', permission: 'batches.create' },
  { to: 'cure.board', label: 'Cure board', icon: 'timer', group: 'floor', permission: ['steps.run', 'deviations.record'] },
  { to: 'tests.final', label: 'Final test', icon: 'fact_check', group: 'floor', permission: 'tests.record' },
  { to: 'readings.list', label: 'Shop conditions', icon: 'device_thermostat', group: 'floor', permission: 'readings.record' },

  { to: 'lots.list', label: 'Lots', icon: 'inventory_2', group: 'oversight' },
  // Everyone may read a trace (a scanned driver or lot links to it); the menu offers the trace
  // search to those who decide on lots, who use it for containment.
  { to: 'trace.search', label: 'Trace', icon: 'account_tree', group: 'oversight', permission: 'lots.release' },
  { to: 'alerts.list', label: 'Alerts', icon: 'notifications', group: 'oversight', permission: 'alerts.resolve' },
  { to: 'stock.overview', label: 'Stock & expiry', icon: 'event_busy', group: 'oversight', permission: 'stock.read' },
  { to: 'stock.outlook', label: 'Expiry outlook', icon: 'stacked_bar_chart', group: 'oversight', permission: 'stock.read' },
  { to: 'quality.overview', label: 'Quality overview', icon: 'insights', group: 'oversight', permission: 'quality.overview' },
  { to: 'audit.list', label: 'Audit trail', icon: 'policy', group: 'oversight', permission: 'audit.read' },
  { to: 'mail.box', label: 'Mailbox', icon: 'mail', group: 'oversight' },

  { to: 'catalogue.materials', label: 'Materials', icon: 'science', group: 'catalogue', permission: 'materials.edit' },
  { to: 'catalogue.suppliers', label: 'Suppliers', icon: 'local_shipping', group: 'catalogue', permission: 'suppliers.edit' },
  { to: 'catalogue.stations', label: 'Stations', icon: 'place', group: 'catalogue', permission: 'stations.edit' },
  { to: 'catalogue.models', label: 'Driver models', icon: 'speaker', group: 'catalogue', permission: 'models.edit' },

  { to: 'users.list', label: 'Users', icon: 'manage_accounts', group: 'admin', permission: 'users.manage' },
];

/** The items a user may see (`can` answers for the user, e.g. the session's), among those whose route exists. */
export function visibleNavItems(
  can: (...actions: Action[]) => boolean,
  routeExists: (name: string) => boolean,
  items: readonly NavItem[] = NAV_ITEMS,
): NavItem[] {
  return items.filter((item) => routeExists(item.to) && (!item.permission || can(...actionsOf(item.permission))));
}

/** Visible items grouped for the drawer, empty groups left out. */
export function groupNavItems(items: readonly NavItem[]): { group: NavGroup; items: NavItem[] }[] {
  return NAV_GROUPS.map((group) => ({ group, items: items.filter((item) => item.group === group.id) })).filter(
    (entry) => entry.items.length > 0,
  );
}
