import type { Role } from '@shared/constants';

/** How each role is named on screen. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  receiving: 'Receiving',
  assembler: 'Assembler',
  quality: 'Quality',
  purchasing: 'Purchasing',
};

/** True when `allowed` is empty/absent or the user holds at least one of the allowed roles. */
export function rolesAllow(allowed: readonly Role[] | undefined, held: readonly Role[]): boolean {
  if (!allowed || allowed.length === 0) return true;
  return allowed.some((role) => held.includes(role));
}
