import crypto from 'node:crypto';
import { db } from '../../db/client';
import { users } from '../../db/schema';
import type { CreateUserInput, CreateUserResult } from '../../../shared/schemas/users';
import { requirePermission, type Actor } from '../auth/actor';
import { hashPassword } from '../auth';
import { enforcePasswordPolicy } from '../auth/password-policy';
import { readSetting } from '../settings';
import { recordAudit } from '../audit';
import { userItem } from './list';
import { roleWord } from '../../../shared/words';

/** Letters and digits that cannot be mistaken for one another when read aloud or copied by hand (no 0/O, 1/l/I). */
const ALPHABET = 'abcdefghijkmnpqrstuvwxyzABCDEFGHJKLMNPQRSTUVWXYZ23456789';

/**
 * A temporary password: groups of four characters drawn uniformly (rejection sampling) from a
 * 56-character alphabet with node's CSPRNG, at least 16 characters (about 93 bits) and never
 * shorter than the plant's minimum.
 */
export function temporaryPassword(minLength = 16): string {
  const groups = Math.ceil(Math.max(16, minLength) / 4);
  const chars: string[] = [];
  while (chars.length < groups * 4) {
    for (const byte of crypto.randomBytes(groups * 8)) {
      // 224 = 4 × 56: bytes above it would favour the first letters.
      if (byte < 224 && chars.length < groups * 4) chars.push(ALPHABET[byte % ALPHABET.length]);
    }
  }
  const out: string[] = [];
  for (let i = 0; i < chars.length; i += 4) out.push(chars.slice(i, i + 4).join(''));
  return out.join('-');
}

/**
 * POST /api/users: a new account with a set of roles. With a password, that one (checked by the
 * policy); without, a temporary one made here, returned in this answer only, which the person
 * must change at their first sign-in.
 */
export async function createUser(actor: Actor, input: CreateUserInput): Promise<CreateUserResult> {
  requirePermission(actor, 'users.manage');
  let temporary: string | undefined;
  if (input.password !== undefined) {
    await enforcePasswordPolicy('password', input.password, { email: input.email, name: input.name });
  } else {
    temporary = temporaryPassword(await readSetting('minPasswordLength'));
  }
  const passwordHash = await hashPassword(input.password ?? temporary!);
  const user = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(users)
      .values({ email: input.email, name: input.name, roles: input.roles, passwordHash, mustChangePassword: temporary !== undefined })
      .returning({ id: users.id });
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'user.create',
      entityType: 'user',
      entityId: row.id,
      after: {
        email: input.email,
        name: input.name,
        roles: input.roles.map(roleWord).join(', '),
        password: temporary !== undefined ? 'temporary, to be changed at first sign-in' : 'set by the administrator',
      },
    });
    return userItem(tx, row.id);
  });
  return temporary !== undefined ? { user, temporaryPassword: temporary } : { user };
}
