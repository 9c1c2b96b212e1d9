import { labelLayoutListSchema, type LabelLayout } from '@shared/schemas/labels';
import { apiFetch } from './http';

/** GET /api/labels/layouts (signed in): the label stock Tacklog can print on. */
export async function listLabelLayouts(): Promise<LabelLayout[]> {
  const result = await apiFetch('/api/labels/layouts', { schema: labelLayoutListSchema });
  return result.items;
}

export type LabelTarget = { lotId: string } | { containerIds: readonly string[] };

/**
 * GET /api/labels/render: printable HTML (with @page sizes) for a lot's containers or chosen
 * containers; loaded straight into a preview iframe, so this builds the URL only.
 */
export function labelRenderUrl(layout: string, target: LabelTarget, skip = 0): string {
  const params = new URLSearchParams({ layout });
  if ('lotId' in target) params.set('lotId', target.lotId);
  else params.set('containerIds', target.containerIds.join(','));
  if (skip > 0) params.set('skip', String(skip));
  return `/api/labels/render?${params.toString()}`;
}

/** GET /api/labels/stations: printable HTML with a station's code label (QR + code + name); the URL for a preview frame. */
export function stationLabelUrl(layout: string, stationId: string, copies = 1, skip = 0): string {
  const params = new URLSearchParams({ layout, stationId });
  if (copies > 1) params.set('copies', String(copies));
  if (skip > 0) params.set('skip', String(skip));
  return `/api/labels/stations?${params.toString()}`;
}
