/**
 * The one refusal catalogue (shared/refusals.ts) against the source: every code the server
 * throws or sends, and every code the client compares or says itself, is in the catalogue with
 * a plain title. The source is scanned, not listed by hand.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { REFUSALS, isRefusalCode, refusalStatus, refusalText, refusalTitle } from '../../shared/refusals';

const root = path.resolve(__dirname, '../..');

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const entry of fs.readdirSync(path.join(root, dir), { withFileTypes: true })) {
    const rel = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...sourceFiles(rel));
    else if (/\.(ts|vue)$/.test(entry.name) && !entry.name.endsWith('.d.ts')) out.push(rel);
  }
  return out;
}

/** Codes in one file: thrown (conflict / AppError / sendError), compared (code === 'X') or given as a code. */
function codesIn(text: string): string[] {
  const patterns = [
    /\bconflict\(\s*'([A-Z_]+)'/g,
    /\bnew (?:App|Api)Error\(\s*(?:[^,'()]+,\s*)?'([A-Z_]+)'/g,
    /\bsendError\(\s*\w+,\s*'([A-Z_]+)'/g,
    /\bcode\s*(?:===|!==)\s*'([A-Z_]+)'/g,
    /'([A-Z_]+)'\s*(?:===|!==)\s*[\w.]*code\b/g,
    /\bcode:\s*'([A-Z_]+)'/g,
    /\bfeedback\([^;]*?,\s*'([A-Z_]+)'\)/g,
  ];
  const found: string[] = [];
  for (const re of patterns) for (const m of text.matchAll(re)) found.push(m[1]);
  return found;
}

/** Codes of other software that the server reads from their errors (Node's errno, multer's limits): not ours. */
const FOREIGN = new Set(['ENOENT', 'LIMIT_FILE_SIZE', 'LIMIT_UNEXPECTED_FILE']);

// The demo seed's defect codes (code: 'RUB') are data, not refusals.
const files = [...sourceFiles('server'), ...sourceFiles('src')].filter((f) => !f.startsWith(path.join('server', 'db', 'seed')));
const used = new Map<string, string[]>();
for (const file of files) {
  for (const code of codesIn(fs.readFileSync(path.join(root, file), 'utf8'))) {
    if (!FOREIGN.has(code)) used.set(code, [...(used.get(code) ?? []), file]);
  }
}

describe('refusal catalogue', () => {
  it('finds the codes the source uses (the scan works)', () => {
    for (const code of [
      'LOT_ON_HOLD',
      'WRONG_MATERIAL',
      'CURE_INCOMPLETE',
      'VALIDATION_FAILED',
      'MALFORMED_JSON',
      'TOO_MANY_ATTEMPTS',
      'NETWORK',
      'DUPLICATE_LOT',
    ]) {
      expect(used.has(code), code).toBe(true);
    }
    expect(used.size).toBeGreaterThan(50);
  });

  it('every code thrown, sent or compared anywhere in server/ and src/ is in the catalogue', () => {
    const missing = [...used.entries()]
      .filter(([code]) => !isRefusalCode(code))
      .map(([code, where]) => `${code} (${[...new Set(where)].join(', ')})`);
    expect(missing).toEqual([]);
  });

  it('every entry has a plain title (words, not the code) and a status that fits', () => {
    for (const [code, { status, title }] of Object.entries(REFUSALS)) {
      expect(title.trim().length, code).toBeGreaterThan(2);
      expect(title, code).not.toMatch(/[A-Z]{2,}_|_/);
      expect(title[0], code).toBe(title[0].toUpperCase());
      expect(title.endsWith('.'), code).toBe(false);
      expect(status === 0 || (status >= 400 && status < 600), code).toBe(true);
    }
    // Plant rules refusing a request are 409 (API contract).
    for (const code of ['LOT_ON_HOLD', 'EXPIRED', 'POT_LIFE_EXCEEDED', 'CURE_INCOMPLETE', 'WRONG_MATERIAL'] as const)
      expect(refusalStatus(code)).toBe(409);
  });

  it('titles are unique enough to tell refusals apart (only transport codes share one)', () => {
    const byTitle = new Map<string, string[]>();
    for (const [code, { title }] of Object.entries(REFUSALS)) byTitle.set(title, [...(byTitle.get(title) ?? []), code]);
    const shared = [...byTitle.values()].filter((codes) => codes.length > 1);
    expect(shared).toEqual([['BAD_REQUEST', 'MALFORMED_JSON']]);
  });

  it('what a person reads: the title and the message, never the code; an unknown code reads as a general refusal', () => {
    expect(refusalTitle('LOT_ON_HOLD')).toBe('Lot on hold');
    expect(refusalTitle('SOMETHING_NEW')).toBe('Not accepted');
    expect(refusalTitle(null)).toBe('Not accepted');
    expect(refusalText('LOT_ON_HOLD', 'Lot L-77 awaits incoming inspection.')).toBe('Lot on hold. Lot L-77 awaits incoming inspection.');
    expect(refusalText('EXPIRED', '')).toBe('Expired.');
    // A message that already starts with the title is not repeated.
    expect(refusalText('EXPIRED', 'Expired since 2026-03-01.')).toBe('Expired since 2026-03-01.');
    expect(refusalText('SOMETHING_NEW', 'x')).not.toContain('SOMETHING_NEW');
  });
});
