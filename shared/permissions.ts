/**
 * The one permission map: what each action is, and which roles may do it.
 * Routes (`endpoint({access: 'lots.release'})`), services (`requirePermission`), the router
 * guard (`meta.permission`) and the pages (`session.can('lots.release')`) all ask this map.
 * The server sends the signed-in user's allowed actions as `user.permissions`.
 *
 * Deny by default: an action not listed here is refused to everyone, and a route naming an
 * unknown action fails the permission-map test.
 */
import type { Role } from './constants';

export const PERMISSIONS = {
  // Catalogue
  'materials.edit': ['admin'],
  'suppliers.edit': ['admin', 'purchasing'],
  'models.edit': ['admin'],
  'recipes.edit': ['admin'],
  'stations.edit': ['admin'],
  'defects.edit': ['quality', 'admin'],

  // Receiving and stock handling
  'lots.receive': ['receiving', 'admin'],
  'lots.release': ['quality'],
  'lots.attachCertificate': ['receiving', 'quality'],
  'lots.readCertificate': ['receiving', 'quality', 'admin'],
  'lots.readHistory': ['quality', 'admin'],
  'labels.print': ['receiving', 'quality', 'admin'],
  'containers.handle': ['receiving', 'assembler', 'quality'],
  'containers.empty': ['assembler', 'quality'],
  'containers.scrap': ['quality', 'receiving'],

  // The line
  'batches.create': ['assembler', 'quality'],
  'stations.load': ['assembler'],
  'steps.run': ['assembler'],
  'tests.record': ['assembler', 'quality'],
  'drivers.rework': ['assembler'],
  'drivers.scrap': ['quality'],
  'deviations.record': ['quality'],
  'readings.record': ['assembler', 'quality', 'admin'],

  // Oversight
  'alerts.acknowledge': ['admin', 'receiving', 'assembler', 'quality', 'purchasing'],
  'alerts.resolve': ['admin', 'quality', 'purchasing'],
  'compliance.run': ['admin', 'quality'],
  'stock.read': ['purchasing', 'quality', 'admin'],
  'quality.overview': ['quality', 'admin'],
  'quality.overrideBaseline': ['quality', 'admin'],
  'audit.read': ['quality', 'admin'],
  'audit.verify': ['quality', 'admin'],
  'users.manage': ['admin'],
  'mail.readAll': ['admin'],
  'notifications.manageAll': ['admin'],
  'notifications.sendDigest': ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof PERMISSIONS;

export const ACTIONS = Object.keys(PERMISSIONS) as Action[];

export function isAction(value: string): value is Action {
  return Object.prototype.hasOwnProperty.call(PERMISSIONS, value);
}

/** Roles allowed to do an action (empty for an unknown action: deny by default). */
export function rolesFor(action: string): readonly Role[] {
  return isAction(action) ? PERMISSIONS[action] : [];
}

/** Whether someone holding these roles may do the action. */
export function can(roles: readonly string[], action: string): boolean {
  const allowed = rolesFor(action) as readonly string[];
  return roles.some((r) => allowed.includes(r));
}

/** Every action these roles allow, in map order (what `GET /api/auth/me` sends). */
export function permissionsFor(roles: readonly string[]): Action[] {
  return ACTIONS.filter((a) => can(roles, a));
}
