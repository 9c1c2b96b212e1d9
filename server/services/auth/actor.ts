import type { Role } from '../../../shared/constants';
import { forbidden } from '../../errors';

/** The signed-in person a request acts for. */
export interface Actor {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  /** The session the request came with (absent for actors made by jobs). */
  sessionId?: string;
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
