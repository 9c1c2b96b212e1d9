import { sql } from 'drizzle-orm';
import { db } from '../../../db/client';
import { namedStatement } from '../../../db/named';
import { rowFromJson, rowJson } from '../../../db/row-json';
import { containers, lots, materials } from '../../../db/schema';
import { fieldError, notFound } from '../../../errors';
import { isValidContainerCode, looksLikeContainerCode, normalizeContainerCode } from '../../../../shared/schemas/containers';
import { toMaterial } from '../../catalogue/materials-read';
import { toContainer, toLot } from '../../lots/present';
import type { ScanResolver } from '../types';

/** The container code in a scan: the text itself, or inside a URL (last path segment or `?c=`). */
export function containerCodeIn(text: string): string | null {
  if (looksLikeContainerCode(text)) return text;
  if (!/^https?:\/\//i.test(text)) return null;
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    return null;
  }
  const candidates = [url.searchParams.get('c') ?? '', ...url.pathname.split('/').filter(Boolean).reverse().slice(0, 1)];
  for (const raw of candidates) {
    let candidate = raw;
    try {
      candidate = decodeURIComponent(raw);
    } catch {
      continue;
    }
    if (candidate && looksLikeContainerCode(candidate)) return candidate;
  }
  return null;
}

/**
 * The scan lookup: container, lot and material by code in one named prepared statement (one
 * round trip, parsed and planned once per pooled connection), the three rows as one JSON value
 * each: node-postgres then converts three values instead of some sixty columns (without that
 * per-column work a lookup answers about an eighth more requests a second), and rowFromJson maps
 * them as drizzle's select. Exported for the benchmark's bare-Express ceiling.
 */
export const CONTAINER_BY_CODE = sql`
  SELECT ${rowJson(containers, 'c')} AS container, ${rowJson(lots, 'l')} AS lot, ${rowJson(materials, 'm')} AS material
  FROM ${containers} c
  JOIN ${lots} l ON l.id = c.lot_id
  JOIN ${materials} m ON m.id = l.material_id
  WHERE c.code = ${sql.placeholder('code')}`;

const containerByCode = namedStatement<
  { code: string },
  { container: Record<string, unknown>; lot: Record<string, unknown>; material: Record<string, unknown> }
>('scan_container_by_code', CONTAINER_BY_CODE);

export const containerResolver: ScanResolver = {
  type: 'container',
  async resolve({ code }) {
    const found = containerCodeIn(code);
    if (!found) return null;
    if (!isValidContainerCode(found)) {
      throw fieldError('code', 'looks like a container code but its check symbol (last character) is wrong; check for a typing mistake');
    }
    const [row] = await containerByCode(db, { code: normalizeContainerCode(found) });
    if (!row) throw notFound(`Container ${normalizeContainerCode(found)}`);
    const container = rowFromJson(containers, row.container)!;
    const lot = rowFromJson(lots, row.lot)!;
    const material = rowFromJson(materials, row.material)!;
    return {
      type: 'container',
      container: toContainer(container, lot, material),
      lot: toLot(lot, material),
      material: toMaterial(material),
    };
  },
};
