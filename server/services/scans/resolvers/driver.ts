import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { drivers } from '../../../db/schema';
import { findDriverWithBatch } from '../../drivers/lookup';
import type { ScanResolver } from '../types';
import { findByCode } from './by-code';

/** A driver's serial: `{type: 'driver', driver, batch}`. */
export const driverResolver: ScanResolver = {
  type: 'driver',
  async resolve({ code }) {
    const row = await findByCode(
      code,
      async (c) => (await db.select({ serial: drivers.serial }).from(drivers).where(eq(drivers.serial, c)))[0],
    );
    if (!row) return null;
    const { driver, batch } = await findDriverWithBatch(db, row.serial);
    return { type: 'driver', driver, batch };
  },
};
