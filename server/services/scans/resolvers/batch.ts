import { eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { buildBatches } from '../../../db/schema';
import { batchProgress, findBatch } from '../../batches';
import type { ScanResolver } from '../types';
import { findByCode } from './by-code';

/** A build batch's code (the traveler): `{type: 'batch', batch, currentStep}`. */
export const batchResolver: ScanResolver = {
  type: 'batch',
  async resolve({ code }) {
    const row = await findByCode(
      code,
      async (c) => (await db.select({ id: buildBatches.id }).from(buildBatches).where(eq(buildBatches.code, c)))[0],
    );
    if (!row) return null;
    const { row: b, batch } = await findBatch(db, row.id);
    const next = (await batchProgress(db, b)).pending[0];
    return {
      type: 'batch',
      batch,
      currentStep: next ? { id: next.id, seq: next.seq, name: next.name, stationKind: next.stationKind } : null,
    };
  },
};
