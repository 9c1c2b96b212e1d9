import { and, asc, count, desc, eq, gte, ilike, lte } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { buildBatches, driverModels } from '../../db/schema';
import { notFound } from '../../errors';
import type { Batch, BatchListQuery, BatchPage } from '../../../shared/schemas/batches';

type BatchRow = typeof buildBatches.$inferSelect;
type ModelRow = { code: string; name: string; revision: number };

export function toBatch(row: BatchRow, model: ModelRow): Batch {
  return {
    id: row.id,
    code: row.code,
    modelId: row.modelId,
    modelCode: model.code,
    modelName: model.name,
    modelRevision: model.revision,
    quantity: row.quantity,
    status: row.status,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    completedAt: row.completedAt?.toISOString() ?? null,
  };
}

export async function findBatch(tx: DbOrTx, id: string, lock = false): Promise<{ row: BatchRow; batch: Batch }> {
  const q = tx
    .select({ b: buildBatches, m: { code: driverModels.code, name: driverModels.name, revision: driverModels.revision } })
    .from(buildBatches)
    .innerJoin(driverModels, eq(driverModels.id, buildBatches.modelId))
    .where(eq(buildBatches.id, id));
  const [r] = lock ? await q.for('update', { of: buildBatches }) : await q;
  if (!r) throw notFound('The build batch');
  return { row: r.b, batch: toBatch(r.b, r.m) };
}

export async function listBatches(query: Omit<BatchListQuery, 'format'>, tx: DbOrTx = db): Promise<BatchPage> {
  const where = and(
    query.status ? eq(buildBatches.status, query.status) : undefined,
    query.modelId ? eq(buildBatches.modelId, query.modelId) : undefined,
    query.q ? ilike(buildBatches.code, `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`) : undefined,
    query.createdFrom ? gte(buildBatches.createdAt, new Date(query.createdFrom)) : undefined,
    query.createdTo ? lte(buildBatches.createdAt, new Date(query.createdTo)) : undefined,
  );
  const [rows, [{ n }]] = await Promise.all([
    tx
      .select({ b: buildBatches, m: { code: driverModels.code, name: driverModels.name, revision: driverModels.revision } })
      .from(buildBatches)
      .innerJoin(driverModels, eq(driverModels.id, buildBatches.modelId))
      .where(where)
      .orderBy(desc(buildBatches.createdAt), asc(buildBatches.code))
      .limit(query.limit)
      .offset(query.offset),
    tx.select({ n: count() }).from(buildBatches).where(where),
  ]);
  return { items: rows.map((r) => toBatch(r.b, r.m)), total: n };
}
