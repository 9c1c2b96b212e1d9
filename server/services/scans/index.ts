import { AppError, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import type { ScanResult } from '../../../shared/schemas/scans';
import { resolvers } from './resolvers';
import type { ScanContext } from './types';

/** Symbology identifiers (ISO/IEC 15424) whose data is GS1 element strings. */
const GS1_SYMBOLOGIES = new Set([']C1', ']e0', ']d2', ']Q3', ']J1']);

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
  let code = chars.slice(start, end).join('');
  let gs1Symbology = false;
  const id = /^\][A-Za-z][0-9A-Za-z]/.exec(code)?.[0];
  if (id) {
    gs1Symbology = GS1_SYMBOLOGIES.has(id);
    code = code.slice(3);
  }
  return { code, gs1Symbology };
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
