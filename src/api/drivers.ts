import {
  driverDetailSchema,
  driverResultSchema,
  reworkResultSchema,
  type DriverDetail,
  type DriverResult,
  type ReworkInput,
  type ReworkResult,
  type ScrapInput,
} from '@shared/schemas/drivers';
import { apiFetch } from './http';

const driverPath = (serial: string) => `/api/drivers/${encodeURIComponent(serial)}`;

/** GET /api/drivers/:serial: the unit, its batch and model, test history and rework runs. */
export function getDriver(serial: string): Promise<DriverDetail> {
  return apiFetch(driverPath(serial), { schema: driverDetailSchema });
}

/** POST /api/drivers/:serial/rework/start: one recipe step redone on this unit at a station. */
export function startRework(serial: string, input: ReworkInput, idempotencyKey?: string): Promise<ReworkResult> {
  return apiFetch(`${driverPath(serial)}/rework/start`, { method: 'POST', body: input, schema: reworkResultSchema, idempotencyKey });
}

/** POST /api/drivers/:serial/rework/finish */
export function finishRework(serial: string, input: ReworkInput, idempotencyKey?: string): Promise<ReworkResult> {
  return apiFetch(`${driverPath(serial)}/rework/finish`, { method: 'POST', body: input, schema: reworkResultSchema, idempotencyKey });
}

/** POST /api/drivers/:serial/scrap (quality), with a reason. */
export function scrapDriver(serial: string, input: ScrapInput, idempotencyKey?: string): Promise<DriverResult> {
  return apiFetch(`${driverPath(serial)}/scrap`, { method: 'POST', body: input, schema: driverResultSchema, idempotencyKey });
}
