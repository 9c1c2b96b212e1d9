import type { Role } from '../../../shared/constants';
import { can, rolesFor, type Action } from '../../../shared/permissions';
import { roleWords } from '../../../shared/words';
import { forbidden } from '../../errors';

/** The signed-in person a request acts for. */
export interface Actor {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  /** The session the request came with (absent for actors made by jobs). */
  sessionId?: string;
  /** Signed in with a temporary password: only the routes that let them change it answer. */
  mustChangePassword?: boolean;
}

/** The refusal for someone whose roles do not allow `action`, naming the roles that would. */
export function forbiddenFor(action: Action) {
  const roles = rolesFor(action);
  return forbidden(`Your role does not allow this; it needs ${roles.length === 1 ? 'the role' : 'one of the roles'} ${roleWords(roles)}.`);
}

/**
 * First line of every service operation that needs a permission: the action comes from the
 * one permission map (`shared/permissions.ts`), never a list of roles written here.
 */
export function requirePermission(actor: Actor, action: Action): void {
  if (!can(actor.roles, action)) throw forbiddenFor(action);
}
