import crypto from 'node:crypto';
import { inArray } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { containers } from '../../db/schema';
import { CROCKFORD_ALPHABET, containerCodeFromBody } from '../../../shared/schemas/containers';

/** A fresh container code: 40 random bits as 8 Crockford Base32 symbols plus the check symbol. */
export function randomContainerCode(): string {
  const bytes = crypto.randomBytes(5);
  let bits = 0n;
  for (const b of bytes) bits = (bits << 8n) | BigInt(b);
  let body = '';
  for (let i = 7; i >= 0; i--) body += CROCKFORD_ALPHABET[Number((bits >> BigInt(i * 5)) & 31n)];
  return containerCodeFromBody(body);
}

/** `count` codes not used by any container yet (and distinct among themselves). */
export async function newContainerCodes(tx: Tx, count: number): Promise<string[]> {
  const codes = new Set<string>();
  while (codes.size < count) {
    const fresh: string[] = [];
    while (codes.size + fresh.length < count) {
      const code = randomContainerCode();
      if (!codes.has(code) && !fresh.includes(code)) fresh.push(code);
    }
    const taken = new Set(
      (await tx.select({ code: containers.code }).from(containers).where(inArray(containers.code, fresh))).map((r) => r.code),
    );
    for (const code of fresh) if (!taken.has(code)) codes.add(code);
  }
  return [...codes];
}
