import { inArray } from 'drizzle-orm';
import type { Batch, BatchListQuery } from '../../../shared/schemas/batches';
import { batchStatusWords } from '../../../shared/words';
import { users } from '../../db/schema';
import type { Tx } from '../../db/client';
import type { CsvSink } from '../../csv';
import { exportList, exportTime, timeHeader } from '../exports';
import { listBatches } from './read';

type BatchWithCreator = Batch & { createdByName: string };

async function withCreators(tx: Tx, batches: Batch[]): Promise<BatchWithCreator[]> {
  const ids = [...new Set(batches.map((b) => b.createdBy).filter((id): id is string => !!id))];
  const names = new Map(
    ids.length
      ? (await tx.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))).map((u) => [u.id, u.name])
      : [],
  );
  return batches.map((b) => ({ ...b, createdByName: b.createdBy ? (names.get(b.createdBy) ?? '') : '' }));
}

/** GET /api/batches?format=csv: every batch the same filters list, newest first. */
export function exportBatchesCsv(query: BatchListQuery, sink: CsvSink, now = new Date()): Promise<void> {
  const { format: _format, limit: _limit, offset: _offset, ...filters } = query;
  return exportList<BatchWithCreator>(
    sink,
    {
      list: 'batches',
      what: 'batches',
      header: [
        'Batch',
        'Model code',
        'Model',
        'Recipe revision',
        'Drivers',
        'Status',
        timeHeader('Created'),
        'Created by',
        timeHeader('Completed'),
      ],
      count: async (tx) => (await listBatches({ ...filters, limit: 1, offset: 0 }, tx)).total,
      fetchPage: async (tx, { offset }, limit) => withCreators(tx, (await listBatches({ ...filters, limit, offset }, tx)).items),
      toRow: (b) => [
        b.code,
        b.modelCode,
        b.modelName,
        b.modelRevision,
        b.quantity,
        batchStatusWords(b.status),
        exportTime(b.createdAt),
        b.createdByName,
        exportTime(b.completedAt),
      ],
    },
    now,
  );
}
