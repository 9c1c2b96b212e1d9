import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { stations } from '../../../db/schema';
import { toStation } from '../../stations';
import type { ScanResolver } from '../types';
import { findByCode } from './by-code';

/** A station's code (the label on the station): `{type: 'station', station}`. */
export const stationResolver: ScanResolver = {
  type: 'station',
  async resolve({ code }) {
    const row = await findByCode(code, async (c) => (await db.select().from(stations).where(eq(stations.code, c)))[0]);
    return row ? { type: 'station', station: toStation(row) } : null;
  },
};
