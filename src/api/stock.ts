import {
  outlookSchema,
  stockListSchema,
  stockMaterialSchema,
  stockTodaySchema,
  type Outlook,
  type StockList,
  type StockMaterial,
  type StockSort,
  type StockToday,
  type StockView,
} from '@shared/schemas/stock';
import { apiFetch } from './http';

export interface StockListQuery {
  q?: string | null;
  view?: StockView;
  sort?: StockSort;
  dir?: 'asc' | 'desc';
}

function params(query: StockListQuery): Record<string, string> {
  const out: Record<string, string> = {};
  if (query.q) out.q = query.q;
  if (query.view && query.view !== 'all') out.view = query.view;
  if (query.sort) out.sort = query.sort;
  if (query.dir) out.dir = query.dir;
  return out;
}

/** GET /api/stock: one row per material, filtered and sorted on the server. */
export function listStock(query: StockListQuery, signal?: AbortSignal): Promise<StockList> {
  return apiFetch('/api/stock', { query: params(query), schema: stockListSchema, signal });
}

/** The same rows as CSV (the browser downloads it with the session cookie). */
export function stockCsvUrl(query: StockListQuery): string {
  const search = new URLSearchParams({ ...params(query), format: 'csv' });
  return `/api/stock?${search.toString()}`;
}

/** GET /api/stock/materials/:id: the material's row and its containers in the order of use. */
export function getMaterialStock(materialId: string): Promise<StockMaterial> {
  return apiFetch(`/api/stock/materials/${encodeURIComponent(materialId)}`, { schema: stockMaterialSchema });
}

/** GET /api/stock/outlook: quantity expiring per week, used before expiry vs predicted waste. */
export function getOutlook(weeks = 12): Promise<Outlook> {
  return apiFetch('/api/stock/outlook', { query: { weeks }, schema: outlookSchema });
}

export function outlookCsvUrl(weeks = 12): string {
  return `/api/stock/outlook?weeks=${weeks}&format=csv`;
}

/** GET /api/stock/today: the purchasing home page's three things to act on. */
export function getStockToday(): Promise<StockToday> {
  return apiFetch('/api/stock/today', { schema: stockTodaySchema });
}
