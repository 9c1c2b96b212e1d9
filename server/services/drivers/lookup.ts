import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { buildBatches, driverModels, drivers } from '../../db/schema';
import { notFound } from '../../errors';
import type { Driver, DriverBatch } from '../../../shared/schemas/drivers';

export interface DriverWithBatch {
  driver: Driver;
  batch: DriverBatch;
}

type DriverRow = typeof drivers.$inferSelect;

export function toDriver(d: DriverRow): Driver {
  return { id: d.id, serial: d.serial, batchId: d.batchId, status: d.status, createdAt: d.createdAt.toISOString() };
}

/** A driver by serial with its batch and model, in one query; 404 when unknown. */
export async function findDriverWithBatch(dbx: DbOrTx, serial: string): Promise<DriverWithBatch> {
  const [row] = await dbx
    .select({
      driver: drivers,
      batchId: buildBatches.id,
      batchCode: buildBatches.code,
      batchStatus: buildBatches.status,
      quantity: buildBatches.quantity,
      batchCreatedAt: buildBatches.createdAt,
      modelId: driverModels.id,
      modelCode: driverModels.code,
      modelName: driverModels.name,
      modelRevision: driverModels.revision,
    })
    .from(drivers)
    .innerJoin(buildBatches, eq(buildBatches.id, drivers.batchId))
    .innerJoin(driverModels, eq(driverModels.id, buildBatches.modelId))
    .where(eq(drivers.serial, serial))
    .limit(1);
  if (!row) throw notFound(`Driver ${serial}`);
  return {
    driver: toDriver(row.driver),
    batch: {
      id: row.batchId,
      code: row.batchCode,
      status: row.batchStatus,
      quantity: row.quantity,
      modelId: row.modelId,
      modelCode: row.modelCode,
      modelName: row.modelName,
      modelRevision: row.modelRevision,
      createdAt: row.batchCreatedAt.toISOString(),
    },
  };
}
