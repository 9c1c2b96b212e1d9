import type { Role } from '../../../shared/constants';
import { can, type Action } from '../../../shared/permissions';
import { forbidden } from '../../errors';

/** The signed-in person a request acts for. */
export interface Actor {
  id: string;
  email: string;
  name: string;
  roles: Role[];
}

export function hasRole(actor: Actor, ...roles: Role[]): boolean {
  return roles.some((r) => actor.roles.includes(r));
}

/** First line of every service operation that needs a role. */
export function requireRole(actor: Actor, ...roles: Role[]): void {
  if (!hasRole(actor, ...roles)) {
    throw forbidden(`This needs one of the roles: ${roles.join(', ')}.`);
  }
}

/** First line of every service operation that needs a permission from the one map. */
export function requirePermission(actor: Actor, action: Action): void {
  if (!can(actor.roles, action)) throw forbidden();
}
