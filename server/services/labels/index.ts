import { asc, eq, inArray, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { containers, lots, materials, stations, suppliers } from '../../db/schema';
import { AppError, fieldError, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import type { LabelLayout, LabelRenderQuery, StationLabelQuery } from '../../../shared/schemas/labels';
import { stationKindWords } from '../../../shared/words';
import { PLANT_ZONE, containerExpiryOf } from '../lots/present';
import { findLayout, labelLayouts } from './templates';
import { renderLabelsHtml, renderStationLabelsHtml, type LabelData } from './render';

export function listLabelLayouts(): { items: LabelLayout[] } {
  return { items: labelLayouts() };
}

async function labelData(where: { lotId?: string; containerIds?: string[] }): Promise<LabelData[]> {
  const rows = await db
    .select({
      container: containers,
      lot: lots,
      material: materials,
      supplierName: suppliers.name,
      total: sql<number>`(SELECT count(*)::int FROM ${containers} c2 WHERE c2.lot_id = ${lots.id})`,
    })
    .from(containers)
    .innerJoin(lots, eq(lots.id, containers.lotId))
    .innerJoin(materials, eq(materials.id, lots.materialId))
    .innerJoin(suppliers, eq(suppliers.id, lots.supplierId))
    .where(where.lotId ? eq(containers.lotId, where.lotId) : inArray(containers.id, where.containerIds ?? []))
    .orderBy(asc(containers.seq));
  const now = new Date();
  const byId = new Map(rows.map((r) => [r.container.id, r]));
  const ordered = where.containerIds ? where.containerIds.map((id) => byId.get(id)).filter((r) => r !== undefined) : rows;
  return ordered.map(({ container, lot, material, supplierName, total }) => ({
    code: container.code,
    seq: container.seq,
    total: Number(total),
    materialName: material.name,
    materialCode: material.code,
    supplierName,
    supplierLot: lot.supplierLot,
    receivedAt: lot.receivedAt.toISOString(),
    quantity: Number(container.quantity),
    unit: material.unit,
    storageClass: material.storageClass,
    effectiveExpiry: containerExpiryOf(container, lot, material, now).at,
    hazards: { signalWord: material.hazards?.signalWord, pictograms: material.hazards?.pictograms ?? [] },
  }));
}

/** GET /api/labels/render: print-ready HTML for a lot's containers or for chosen containers. */
export async function renderLabels(actor: Actor, query: LabelRenderQuery): Promise<string> {
  requirePermission(actor, 'labels.print');
  const layout = findLayout(query.layout);
  if (!layout)
    throw fieldError(
      'query.layout',
      `is not a known layout; use one of: ${labelLayouts()
        .map((l) => l.id)
        .join(', ')}`,
    );
  const perPage = layout.grid.cols * layout.grid.rows;
  if (query.skip >= perPage) throw fieldError('query.skip', `must be less than the ${perPage} labels on one page`);
  if (query.lotId) {
    const [lot] = await db.select({ id: lots.id }).from(lots).where(eq(lots.id, query.lotId));
    if (!lot) throw notFound('The lot');
  }
  const ids = query.containerIds ? [...new Set(query.containerIds)] : undefined;
  const data = await labelData({ lotId: query.lotId, containerIds: ids });
  if (ids && data.length !== ids.length) {
    throw new AppError('NOT_FOUND', `${ids.length - data.length} of the containers asked for were not found.`, 404);
  }
  return renderLabelsHtml(layout, data, { zone: PLANT_ZONE, skip: query.skip });
}

/** GET /api/labels/stations: print-ready HTML with a station's code label (QR + code + name). */
export async function renderStationLabels(actor: Actor, query: StationLabelQuery): Promise<string> {
  requirePermission(actor, 'labels.print');
  const layout = findLayout(query.layout);
  if (!layout)
    throw fieldError(
      'query.layout',
      `is not a known layout; use one of: ${labelLayouts()
        .map((l) => l.id)
        .join(', ')}`,
    );
  const perPage = layout.grid.cols * layout.grid.rows;
  if (query.skip >= perPage) throw fieldError('query.skip', `must be less than the ${perPage} labels on one page`);
  const [station] = await db.select().from(stations).where(eq(stations.id, query.stationId));
  if (!station) throw notFound('The station');
  const data = { code: station.code, name: station.name, kind: stationKindWords(station.kind), area: station.area };
  return renderStationLabelsHtml(
    layout,
    Array.from({ length: query.copies }, () => data),
    {
      zone: PLANT_ZONE,
      skip: query.skip,
      title: `Station ${station.code} – code label`,
    },
  );
}
