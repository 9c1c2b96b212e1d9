/** Fetches a container or a mix with its lot(s) and material(s), optionally locking the row. */
import { eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { containers, lots, materials, mixes } from '../../db/schema';
import { AppError } from '../../errors';
import { looksLikeContainerCode, normalizeContainerCode } from '../../../shared/schemas/containers';
import { containerCodeIn } from '../scans/resolvers/container';
import type { ContainerRow, LotRow, MaterialRow, MixRow } from './usability';

export interface ContainerContext {
  container: ContainerRow;
  lot: LotRow;
  material: MaterialRow;
}
export interface MixContext {
  mix: MixRow;
  resin: ContainerContext;
  hardener: ContainerContext;
}

export function unknownCode(field: string, what: string, code: string): AppError {
  return new AppError('NOT_FOUND', `No ${what} has the code "${code}". Check the label and scan again.`, 404, [
    { field, message: 'is not known' },
  ]);
}

/** A scanned container label as stored: the code itself or inside a label URL, case and O/I/L slips mended. */
export function scannedContainerCode(scanned: string): string {
  const inner = containerCodeIn(scanned.trim()) ?? scanned.trim();
  return looksLikeContainerCode(inner) ? normalizeContainerCode(inner) : inner;
}

export async function containerByCode(tx: DbOrTx, scanned: string, field: string): Promise<ContainerContext> {
  const code = scannedContainerCode(scanned);
  const [row] = await tx
    .select({ container: containers, lot: lots, material: materials })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(eq(containers.code, code));
  if (!row) throw unknownCode(field, 'container', code);
  return row;
}

export async function containersByIds(tx: DbOrTx, ids: string[]): Promise<Map<string, ContainerContext>> {
  if (ids.length === 0) return new Map();
  const rows = await tx
    .select({ container: containers, lot: lots, material: materials })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .where(inArray(containers.id, ids));
  return new Map(rows.map((r) => [r.container.id, r]));
}

export async function mixesByIds(tx: DbOrTx, ids: string[]): Promise<Map<string, MixContext>> {
  if (ids.length === 0) return new Map();
  const mixRows = await tx.select().from(mixes).where(inArray(mixes.id, ids));
  const parts = await containersByIds(
    tx,
    mixRows.flatMap((m) => [m.resinContainerId, m.hardenerContainerId]),
  );
  return new Map(
    mixRows.map((m) => [m.id, { mix: m, resin: parts.get(m.resinContainerId)!, hardener: parts.get(m.hardenerContainerId)! }]),
  );
}

export async function mixByCode(tx: DbOrTx, code: string, field: string): Promise<MixContext> {
  const [row] = await tx.select({ id: mixes.id }).from(mixes).where(eq(mixes.code, code));
  if (!row) throw unknownCode(field, 'mix', code);
  return (await mixesByIds(tx, [row.id])).get(row.id)!;
}

export type { ContainerRow, LotRow, MaterialRow, MixRow };
