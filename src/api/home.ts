import { homeFiguresSchema, type HomeFigures } from '@shared/schemas/home';
import { apiFetch } from './http';

/** GET /api/home: the figures of the signed-in person's day, one section per role. */
export function getHomeFigures(query: { stationId?: string | null }, signal?: AbortSignal): Promise<HomeFigures> {
  return apiFetch('/api/home', { query: { stationId: query.stationId ?? undefined }, schema: homeFiguresSchema, signal });
}
