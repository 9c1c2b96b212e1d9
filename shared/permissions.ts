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
  /** Create, change and retire materials; upload their safety data sheets. */
  'materials.edit': ['admin'],
  /** Create, change and retire suppliers. */
  'suppliers.edit': ['admin', 'purchasing'],
  /** Create driver models; rename, describe, retire them. */
  'models.edit': ['admin'],
  /** Write a model's process recipe (its steps and materials). */
  'recipes.edit': ['admin'],
  /** Create, change and retire stations. */
  'stations.edit': ['admin'],
  /** Keep the list of defect codes for final test. */
  'defects.edit': ['quality', 'admin'],

  // Receiving and stock handling
  /** Record an incoming lot and its containers. */
  'lots.receive': ['receiving', 'admin'],
  /** Decide on a lot: release, quarantine, lift a quarantine, reject. */
  'lots.release': ['quality'],
  /** Add or replace a lot's certificate of analysis. */
  'lots.attachCertificate': ['receiving', 'quality'],
  'lots.readCertificate': ['receiving', 'quality', 'admin'],
  /**
   * A lot's full history: every audit entry with who did it and the old and new values.
   * Everyone else sees the lot's status changes only (status, when, reason).
   */
  'lots.readHistory': ['quality', 'admin'],
  /** Print and reprint container labels. */
  'labels.print': ['receiving', 'quality', 'admin'],
  /** Open, thaw, move, take out of and return to cold storage. */
  'containers.handle': ['receiving', 'assembler', 'quality'],
  /** Record a container as used to the end: done where it is used, not at the dock. */
  'containers.empty': ['assembler', 'quality'],
  /** Take a container out of use for a reason (damaged, contaminated …). */
  'containers.scrap': ['quality', 'receiving'],

  // The line
  /** Open a build batch and its driver serials. */
  'batches.create': ['assembler', 'quality'],
  /** Load and unload containers and mixes at a station. */
  'stations.load': ['assembler'],
  /** Mix a two-part adhesive at a station (its pot life starts). */
  'mixes.create': ['assembler'],
  /** Start and finish a recipe step for a batch. */
  'steps.run': ['assembler'],
  /** Record a final test result. */
  'tests.record': ['assembler', 'quality'],
  /** Start and finish rework of a failed driver. */
  'drivers.rework': ['assembler'],
  /** Scrap a driver. */
  'drivers.scrap': ['quality'],
  /** Record a deviation (e.g. allow a step before its cure is complete). */
  'deviations.record': ['quality'],
  /** Record temperature and humidity readings of an area. */
  'readings.record': ['assembler', 'quality', 'admin'],

  // Oversight
  /** Every alert, whatever its audience (others see the alerts meant for their roles). */
  'alerts.readAll': ['admin'],
  'alerts.acknowledge': ['admin', 'receiving', 'assembler', 'quality', 'purchasing'],
  'alerts.resolve': ['admin', 'quality', 'purchasing'],
  /** Run the compliance watch now instead of waiting for its schedule. */
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

  // Home page: one section of figures per role, each for that role alone (a person with two
  // roles sees both sections; an administrator does not see the others' days).
  /** Lots received today and lots on hold. */
  'home.receiving': ['receiving'],
  /** My station's batch and the cures ending soon. */
  'home.assembler': ['assembler'],
  /** Live alerts by severity, lots awaiting inspection, failures today, quarantine advised. */
  'home.quality': ['quality'],
  /** Run-outs inside lead time, waste predicted this month, lots expiring soon. */
  'home.purchasing': ['purchasing'],
  /** Users, stations and the state of the audit chain. */
  'home.admin': ['admin'],
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
