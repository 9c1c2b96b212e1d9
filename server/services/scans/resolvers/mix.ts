import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { mixes } from '../../../db/schema';
import { expiryOfMix, mixesByIds } from '../../loading';
import { toMix } from '../../mixes';
import type { ScanResolver } from '../types';
import { findByCode } from './by-code';

/** A two-part mix's code: `{type: 'mix', mix, expiresAt, expiryCause}`. */
export const mixResolver: ScanResolver = {
  type: 'mix',
  async resolve({ code }) {
    const row = await findByCode(code, async (c) => (await db.select({ id: mixes.id }).from(mixes).where(eq(mixes.code, c)))[0]);
    if (!row) return null;
    const m = (await mixesByIds(db, [row.id])).get(row.id)!;
    const expiry = expiryOfMix(m.mix, [m.resin, m.hardener]);
    return { type: 'mix', mix: toMix(m.mix, m.resin, m.hardener), expiresAt: expiry.at!, expiryCause: expiry.cause! };
  },
};
