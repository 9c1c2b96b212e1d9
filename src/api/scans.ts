import { z } from 'zod';
import { scanResultSchema, type ScanResult } from '@shared/schemas/scans';
import { apiFetch } from './http';

/** A kind of scan answer this client does not show yet (e.g. a station, batch or driver). */
export interface OtherScanResult {
  type: string;
  [key: string]: unknown;
}

const anyScanSchema = z.union([scanResultSchema, z.looseObject({ type: z.string() })]);

/**
 * POST /api/scans/resolve (signed in): what a scanned or typed code is. 400 for a malformed
 * code (the message says what is wrong), 404 for a code Tacklog does not know.
 */
export function resolveScan(code: string): Promise<ScanResult | OtherScanResult> {
  return apiFetch('/api/scans/resolve', { method: 'POST', body: { code }, schema: anyScanSchema });
}

export function isKnownScan(result: ScanResult | OtherScanResult): result is ScanResult {
  return scanResultSchema.safeParse(result).success;
}
