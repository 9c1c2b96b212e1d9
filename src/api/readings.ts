import { readingPageSchema, readingSchema, type Reading, type ReadingInput } from '@shared/schemas/readings';
import { apiFetch } from './http';

/** POST /api/readings (assembler, quality, admin): one temperature / humidity reading for an area. */
export function recordReading(input: ReadingInput, idempotencyKey?: string): Promise<Reading> {
  return apiFetch('/api/readings', { method: 'POST', body: input, schema: readingSchema, idempotencyKey });
}

/** GET /api/readings: newest first. */
export async function listReadings(
  filter: { area?: string; stationId?: string; measure?: 'temperature' | 'irradiance'; from?: string; to?: string; limit?: number } = {},
): Promise<Reading[]> {
  const result = await apiFetch('/api/readings', { schema: readingPageSchema, query: { ...filter } });
  return result.items;
}
