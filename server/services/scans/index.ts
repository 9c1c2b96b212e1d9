import { AppError, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import type { ScanResult } from '../../../shared/schemas/scans';
import { GS1_SYMBOLOGY_IDS, splitSymbologyId } from '../../../shared/gs1';
import { resolvers } from './resolvers';
import type { ScanContext } from './types';

const STX = 0x02;
const ETX = 0x03;
const GS = 0x1d;
const isFraming = (ch: string) => /\s/.test(ch) || ch.charCodeAt(0) === STX || ch.charCodeAt(0) === ETX;

/** A control character other than the GS1 group separator (which marks the end of a field). */
function hasForeignControl(code: string): boolean {
  return Array.from(code).some((ch) => {
    const c = ch.charCodeAt(0);
    return (c < 0x20 && c !== GS) || c === 0x7f;
  });
}

/**
 * Removes what keyboard-wedge scanners add around the data: CR/LF/tab and spaces at the ends,
 * STX/ETX framing, and a leading symbology identifier like `]Q1` (kept as a GS1 hint).
 */
export function cleanScan(raw: string): { code: string; gs1Symbology: boolean } {
  const chars = Array.from(raw);
  let start = 0;
  let end = chars.length;
  while (start < end && isFraming(chars[start])) start++;
  while (end > start && isFraming(chars[end - 1])) end--;
  const { id, data: code } = splitSymbologyId(chars.slice(start, end).join(''));
  return { code, gs1Symbology: id !== null && GS1_SYMBOLOGY_IDS.has(id) };
}

/** POST /api/scans/resolve: what a scanned code is. */
export async function resolveScan(actor: Actor, raw: string): Promise<ScanResult> {
  const { code, gs1Symbology } = cleanScan(raw);
  if (code === '') throw fieldError('code', 'is empty');
  if (hasForeignControl(code)) throw fieldError('code', 'contains control characters a code cannot have');
  const ctx: ScanContext = { actor, code, gs1Symbology };
  for (const resolver of resolvers) {
    const result = await resolver.resolve(ctx);
    if (result) return result;
  }
  throw new AppError('NOT_FOUND', `No container or other record has the code "${code.slice(0, 60)}".`, 404);
}
