import { eq, sql } from 'drizzle-orm';
import { db } from '../../../db/client';
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
 * The scan lookup: container, lot and material by code in one joined, named prepared statement
 * (one round trip, parsed and planned once per pooled connection).
 */
const containerByCode = db
  .select({ container: containers, lot: lots, material: materials })
  .from(containers)
  .innerJoin(lots, eq(lots.id, containers.lotId))
  .innerJoin(materials, eq(materials.id, lots.materialId))
  .where(eq(containers.code, sql.placeholder('code')))
  .prepare('scan_container_by_code');

export const containerResolver: ScanResolver = {
  type: 'container',
  async resolve({ code }) {
    const found = containerCodeIn(code);
    if (!found) return null;
    if (!isValidContainerCode(found)) {
      throw fieldError('code', 'looks like a container code but its check symbol (last character) is wrong; check for a typing mistake');
    }
    const [ctx] = await containerByCode.execute({ code: normalizeContainerCode(found) });
    if (!ctx) throw notFound(`Container ${normalizeContainerCode(found)}`);
    return {
      type: 'container',
      container: toContainer(ctx.container, ctx.lot, ctx.material),
      lot: toLot(ctx.lot, ctx.material),
      material: toMaterial(ctx.material),
    };
  },
};
