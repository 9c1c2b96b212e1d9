/**
 * GS1 identifiers on supplier labels and on Tacklog's own container labels.
 *
 * Reads the three forms a scanner or a person may hand us:
 *  - human-readable element strings with the AIs in parentheses: `(01)09521234543213(17)261231(10)ABC123`
 *  - raw element strings as a scanner sends them, in any order of AIs: variable-length fields that
 *    are not last end with the ASCII group separator (GS, 0x1D); an optional symbology identifier
 *    (`]C1`, `]d2`, `]Q3`, `]e0` …) and a leading FNC1/GS are ignored
 *  - GS1 Digital Link URIs: `https://{domain}/{optional/prefix}/01/{gtin}/10/{lot}/21/{serial}?17={yymmdd}`
 *
 * Sources: GS1 General Specifications (AI formats, predefined-length table, check digit, §7.12
 * century rule), GS1 Digital Link URI syntax 1.2. Pure code: no I/O.
 */

export type Gs1Field =
  | 'input'
  | 'sscc'
  | 'gtin'
  | 'lot'
  | 'producedOn'
  | 'dueOn'
  | 'packedOn'
  | 'bestBefore'
  | 'sellBy'
  | 'expiresOn'
  | 'variant'
  | 'serial'
  | 'additionalId'
  | 'customerPartNo'
  | 'secondarySerial'
  | 'count'
  | 'netWeightKg'
  | 'purchaseOrder'
  | 'internal'
  | 'domain';

export class Gs1Error extends Error {
  readonly field: Gs1Field;
  readonly ai?: string;
  constructor(field: Gs1Field, message: string, ai?: string) {
    super(message);
    this.name = 'Gs1Error';
    this.field = field;
    this.ai = ai;
  }
}

export interface Gs1Element {
  ai: string;
  value: string;
}

export interface Gs1Result {
  gtin?: string;
  lot?: string;
  /** YYYY-MM-DD */
  expiresOn?: string;
  /** YYYY-MM-DD */
  producedOn?: string;
  serial?: string;
  count?: number;
  elements: Gs1Element[];
}

type Kind = 'gtin' | 'sscc' | 'date' | 'num' | 'alnum' | 'decimal';

interface AiSpec {
  field: Gs1Field;
  kind: Kind;
  /** exact length for fixed-length AIs */
  fixed?: number;
  /** maximum length for variable-length AIs */
  max?: number;
  title: string;
}

/** Supported AIs, with formats from the GS1 General Specifications / Barcode Syntax Dictionary. */
const AIS: Record<string, AiSpec> = {
  '00': { field: 'sscc', kind: 'sscc', fixed: 18, title: 'SSCC' },
  '01': { field: 'gtin', kind: 'gtin', fixed: 14, title: 'GTIN' },
  '02': { field: 'gtin', kind: 'gtin', fixed: 14, title: 'GTIN of contained trade items' },
  '10': { field: 'lot', kind: 'alnum', max: 20, title: 'batch/lot number' },
  '11': { field: 'producedOn', kind: 'date', fixed: 6, title: 'production date' },
  '12': { field: 'dueOn', kind: 'date', fixed: 6, title: 'due date' },
  '13': { field: 'packedOn', kind: 'date', fixed: 6, title: 'packaging date' },
  '15': { field: 'bestBefore', kind: 'date', fixed: 6, title: 'best before date' },
  '16': { field: 'sellBy', kind: 'date', fixed: 6, title: 'sell by date' },
  '17': { field: 'expiresOn', kind: 'date', fixed: 6, title: 'expiration date' },
  '20': { field: 'variant', kind: 'num', fixed: 2, title: 'internal product variant' },
  '21': { field: 'serial', kind: 'alnum', max: 20, title: 'serial number' },
  '240': { field: 'additionalId', kind: 'alnum', max: 30, title: 'additional product identification' },
  '241': { field: 'customerPartNo', kind: 'alnum', max: 30, title: 'customer part number' },
  '250': { field: 'secondarySerial', kind: 'alnum', max: 30, title: 'secondary serial number' },
  '30': { field: 'count', kind: 'num', max: 8, title: 'count of items' },
  '37': { field: 'count', kind: 'num', max: 8, title: 'count of trade items' },
  '400': { field: 'purchaseOrder', kind: 'alnum', max: 30, title: "customer's purchase order number" },
};
for (let d = 0; d <= 5; d++) {
  AIS[`310${d}`] = { field: 'netWeightKg', kind: 'decimal', fixed: 6, title: 'net weight, kg' };
}
for (let ai = 91; ai <= 99; ai++) {
  AIS[String(ai)] = { field: 'internal', kind: 'alnum', max: 90, title: 'company internal information' };
}

/**
 * GS1 General Specifications, predefined-length table: element strings whose AI starts with these
 * two digits have a fixed total length (AI + data) and need no separator after them.
 */
const PREDEFINED_LENGTH: Record<string, number> = {
  '00': 20,
  '01': 16,
  '02': 16,
  '03': 16,
  '04': 18,
  '11': 8,
  '12': 8,
  '13': 8,
  '14': 8,
  '15': 8,
  '16': 8,
  '17': 8,
  '18': 8,
  '19': 8,
  '20': 4,
  '31': 10,
  '32': 10,
  '33': 10,
  '34': 10,
  '35': 10,
  '36': 10,
  '41': 16,
};

const GS = '\u001d';
/** GS1 AI encodable character set 82 (GS1 General Specifications, Figure 7.11-1). */
const CSET82 = /^[!"%&'()*+,\-./0-9:;<=>?A-Z_a-z]*$/;

// ---------------------------------------------------------------- check digits

/**
 * GS1 check digit (gs1.org "How to calculate a check digit manually"): from the rightmost data
 * digit leftwards, weights 3, 1, 3, 1 …; the check digit brings the sum up to a multiple of ten.
 * Works for GTIN-8/12/13/14 and SSCC data digits.
 */
export function gtinCheckDigit(digitsWithoutCheck: string): number {
  if (!/^\d+$/.test(digitsWithoutCheck)) {
    throw new Gs1Error('gtin', 'GTIN must contain digits only');
  }
  let sum = 0;
  for (let i = 0; i < digitsWithoutCheck.length; i++) {
    const digit = digitsWithoutCheck.charCodeAt(digitsWithoutCheck.length - 1 - i) - 48;
    sum += digit * (i % 2 === 0 ? 3 : 1);
  }
  return (10 - (sum % 10)) % 10;
}

/** True for a GTIN-8, -12, -13 or -14 made of digits with the right check digit. */
export function isValidGtin(gtin: string): boolean {
  if (!/^\d+$/.test(gtin) || ![8, 12, 13, 14].includes(gtin.length)) return false;
  return gtinCheckDigit(gtin.slice(0, -1)) === Number(gtin[gtin.length - 1]);
}

function verifyCheckDigit(value: string, field: Gs1Field, label: string, ai: string): void {
  const expected = gtinCheckDigit(value.slice(0, -1));
  const got = Number(value[value.length - 1]);
  if (expected !== got) {
    throw new Gs1Error(field, `${label} check digit is wrong: expected ${expected}, got ${got}`, ai);
  }
}

// ---------------------------------------------------------------- dates

function lastDayOfMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/**
 * Full year for a two-digit year, GS1 General Specifications §7.12: with d = YY − (current year
 * mod 100), 51…99 → previous century, −99…−50 → next century, otherwise the current century.
 */
export function gs1Century(yy: number, now: Date = new Date()): number {
  const current = now.getUTCFullYear();
  const century = Math.floor(current / 100) * 100;
  const diff = yy - (current % 100);
  if (diff >= 51) return century - 100 + yy;
  if (diff <= -50) return century + 100 + yy;
  return century + yy;
}

/**
 * YYMMDD → YYYY-MM-DD. Day `00` means the last day of the month (GS1 General Specifications).
 * Throws Gs1Error for a month outside 01–12 or a day the month does not have.
 */
export function parseGs1Date(yymmdd: string, field: Gs1Field = 'expiresOn', now: Date = new Date(), ai = '17'): string {
  if (!/^\d{6}$/.test(yymmdd)) throw new Gs1Error(field, `date must be 6 digits YYMMDD, got "${yymmdd}"`, ai);
  const year = gs1Century(Number(yymmdd.slice(0, 2)), now);
  const month = Number(yymmdd.slice(2, 4));
  let day = Number(yymmdd.slice(4, 6));
  if (month < 1 || month > 12) throw new Gs1Error(field, `date ${yymmdd} has month ${month}, not 01–12`, ai);
  const last = lastDayOfMonth(year, month);
  if (day === 0) day = last;
  if (day > last) throw new Gs1Error(field, `date ${yymmdd} has day ${day}, but that month has ${last} days`, ai);
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

/** YYYY-MM-DD → YYMMDD for AI 17 and friends. */
export function toGs1Date(isoDate: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!m) throw new Gs1Error('expiresOn', `date must be YYYY-MM-DD, got "${isoDate}"`, '17');
  const [, y, mo, d] = m;
  const month = Number(mo);
  if (month < 1 || month > 12 || Number(d) < 1 || Number(d) > lastDayOfMonth(Number(y), month)) {
    throw new Gs1Error('expiresOn', `${isoDate} is not a real calendar date`, '17');
  }
  return `${y.slice(2)}${mo}${d}`;
}

// ---------------------------------------------------------------- element validation

function checkElement(ai: string, value: string, now: Date): Gs1Element {
  const spec = AIS[ai];
  if (!spec) throw new Gs1Error('input', `unknown or unsupported GS1 Application Identifier (${ai})`, ai);
  const name = `(${ai}) ${spec.title}`;
  if (value.length === 0) throw new Gs1Error(spec.field, `${name} is empty`, ai);
  if (spec.fixed !== undefined && value.length !== spec.fixed) {
    throw new Gs1Error(spec.field, `${name} must be ${spec.fixed} characters long, got ${value.length}`, ai);
  }
  if (spec.max !== undefined && value.length > spec.max) {
    throw new Gs1Error(spec.field, `${name} is too long: at most ${spec.max} characters, got ${value.length}`, ai);
  }
  if (spec.kind === 'alnum') {
    if (!CSET82.test(value)) {
      throw new Gs1Error(spec.field, `${name} contains characters GS1 does not allow`, ai);
    }
  } else if (!/^\d+$/.test(value)) {
    throw new Gs1Error(spec.field, `${name} must contain digits only`, ai);
  }
  if (spec.kind === 'gtin') verifyCheckDigit(value, 'gtin', 'GTIN', ai);
  if (spec.kind === 'sscc') verifyCheckDigit(value, 'sscc', 'SSCC', ai);
  if (spec.kind === 'date') parseGs1Date(value, spec.field, now, ai);
  return { ai, value };
}

function buildResult(elements: Gs1Element[], now: Date): Gs1Result {
  const seen = new Map<string, string>();
  for (const { ai, value } of elements) {
    const before = seen.get(ai);
    if (before !== undefined && before !== value) {
      throw new Gs1Error(AIS[ai]?.field ?? 'input', `(${ai}) appears twice with different values`, ai);
    }
    seen.set(ai, value);
  }
  const result: Gs1Result = { elements };
  const get = (ai: string) => seen.get(ai);
  if (get('01') !== undefined) result.gtin = get('01');
  if (get('10') !== undefined) result.lot = get('10');
  if (get('21') !== undefined) result.serial = get('21');
  if (get('17') !== undefined) result.expiresOn = parseGs1Date(get('17')!, 'expiresOn', now, '17');
  if (get('11') !== undefined) result.producedOn = parseGs1Date(get('11')!, 'producedOn', now, '11');
  const count = get('30') ?? get('37');
  if (count !== undefined) result.count = Number(count);
  return result;
}

// ---------------------------------------------------------------- the three syntaxes

function findAi(s: string, at: number): string {
  for (const len of [2, 3, 4]) {
    const candidate = s.slice(at, at + len);
    if (candidate.length === len && /^\d+$/.test(candidate) && AIS[candidate]) return candidate;
  }
  const shown = s.slice(at, at + 4).replace(/[^\x20-\x7e]/g, '?');
  throw new Gs1Error('input', `unknown or unsupported GS1 Application Identifier at "${shown}"`);
}

function parseRaw(s: string, now: Date): Gs1Element[] {
  const elements: Gs1Element[] = [];
  let at = 0;
  while (at < s.length) {
    if (s[at] === GS) {
      at++;
      continue;
    }
    const ai = findAi(s, at);
    at += ai.length;
    const predefined = PREDEFINED_LENGTH[ai.slice(0, 2)];
    let value: string;
    if (predefined !== undefined) {
      const length = predefined - ai.length;
      value = s.slice(at, at + length);
      if (value.includes(GS) || value.length < length) {
        const cut = value.includes(GS) ? value.slice(0, value.indexOf(GS)) : value;
        throw new Gs1Error(AIS[ai].field, `(${ai}) ${AIS[ai].title} must be ${length} characters long, got ${cut.length}`, ai);
      }
      at += value.length;
    } else {
      const end = s.indexOf(GS, at);
      value = end === -1 ? s.slice(at) : s.slice(at, end);
      at = end === -1 ? s.length : end + 1;
    }
    elements.push(checkElement(ai, value, now));
  }
  return elements;
}

function parseBracketed(s: string, now: Date): Gs1Element[] {
  const elements: Gs1Element[] = [];
  const aiAt = /\((\d{2,4})\)/g;
  const marks: { ai: string; start: number; end: number }[] = [];
  for (let m = aiAt.exec(s); m; m = aiAt.exec(s)) {
    // Every "(digits)" is read as an AI: an unknown one is refused rather than glued to a value.
    marks.push({ ai: m[1], start: m.index, end: m.index + m[0].length });
  }
  if (marks.length === 0 || marks[0].start !== 0) {
    throw new Gs1Error('input', 'element string must start with an AI in parentheses, e.g. (01)');
  }
  marks.forEach((mark, i) => {
    const stop = i + 1 < marks.length ? marks[i + 1].start : s.length;
    const value = s.slice(mark.end, stop).trim();
    elements.push(checkElement(mark.ai, value, now));
  });
  return elements;
}

function decode(part: string): string {
  try {
    return decodeURIComponent(part);
  } catch {
    throw new Gs1Error('input', `badly percent-encoded part "${part}" in the Digital Link`);
  }
}

const DL_PRIMARY = new Set(['01', '00']);

function parseDigitalLink(s: string, now: Date): Gs1Element[] {
  let url: URL;
  try {
    url = new URL(s);
  } catch {
    throw new Gs1Error('input', 'not a valid URL');
  }
  const segments = url.pathname.split('/').filter((p) => p !== '');
  const start = segments.findIndex((seg, i) => DL_PRIMARY.has(seg) && i + 1 < segments.length);
  if (start === -1) throw new Gs1Error('input', 'Digital Link has no primary key (/01/{gtin} or /00/{sscc}) in its path');
  const path = segments.slice(start);
  if (path.length % 2 !== 0) throw new Gs1Error('input', 'Digital Link path must alternate AI and value');
  const elements: Gs1Element[] = [];
  for (let i = 0; i < path.length; i += 2) {
    const ai = path[i];
    let value = decode(path[i + 1]);
    // GS1 Digital Link: a GTIN-8/12/13 in the path stands for its 14-digit form.
    if (ai === '01' && /^\d{8}$|^\d{12,13}$/.test(value)) value = value.padStart(14, '0');
    elements.push(checkElement(ai, value, now));
  }
  const query = url.search.replace(/^\?/, '');
  for (const pair of query.split('&')) {
    if (pair === '') continue;
    const eq = pair.indexOf('=');
    const key = decode(eq === -1 ? pair : pair.slice(0, eq));
    // Non-numeric keys (linkType, context …) are not AIs and are ignored, as the standard allows.
    if (!/^\d{2,4}$/.test(key)) continue;
    elements.push(checkElement(key, eq === -1 ? '' : decode(pair.slice(eq + 1)), now));
  }
  return elements;
}

/** Symbology identifier (ISO/IEC 15424): `]` + symbology letter + modifier, e.g. `]C1`, `]d2`, `]Q3`, `]e0`. */
const SYMBOLOGY_ID = /^\][A-Za-z][0-9A-Za-z]/;
/**
 * Symbology identifiers whose data is a GS1 element string (GS1 General Specifications, table of
 * symbology identifiers): GS1-128 `]C1`, GS1 DataBar and composite `]e0`, GS1 DataMatrix `]d2`,
 * GS1 QR Code `]Q3`, GS1 DotCode `]J1`.
 */
export const GS1_SYMBOLOGY_IDS: ReadonlySet<string> = new Set([']C1', ']e0', ']d2', ']Q3', ']J1']);

/** Removes a leading symbology identifier; says which one it was (or null). */
export function splitSymbologyId(input: string): { id: string | null; data: string } {
  const id = SYMBOLOGY_ID.exec(input)?.[0] ?? null;
  return id ? { id, data: input.slice(id.length) } : { id: null, data: input };
}

/**
 * Parse any of the three GS1 syntaxes into its elements and the fields Tacklog uses.
 * GS1 fixes no order for element strings in a barcode (only that variable-length ones that are
 * not last end with FNC1/GS), so any sequence of valid AIs is read: `(17)…(01)…(10)…` as well as
 * the raw `17…01…10…`. A symbology identifier (`]C1`, `]d2`, `]Q3`, `]e0` …) may lead, before an
 * element string or a Digital Link. Throws Gs1Error naming the field for anything wrong.
 */
export function parseGs1(input: string, now: Date = new Date()): Gs1Result {
  let s = (input ?? '').replace(/^[\r\n\t ]+|[\r\n\t ]+$/g, '');
  if (s === '') throw new Gs1Error('input', 'nothing to read: the scan is empty');
  s = splitSymbologyId(s).data;
  if (/^https?:\/\//i.test(s)) return buildResult(parseDigitalLink(s, now), now);
  if (s.startsWith('(')) return buildResult(parseBracketed(s, now), now);
  while (s.startsWith(GS)) s = s.slice(1); // leading FNC1
  if (s === '') throw new Gs1Error('input', 'nothing to read: the scan is empty');
  return buildResult(parseRaw(s, now), now);
}

/**
 * The AIs of a raw element string, cut by length only (values not checked), or null when it does
 * not split into known AIs with non-empty values. Used to tell GS1 data from other codes.
 */
function rawAiSequence(s: string): string[] | null {
  const ais: string[] = [];
  let at = 0;
  while (at < s.length) {
    if (s[at] === GS) {
      at++;
      continue;
    }
    let ai: string;
    try {
      ai = findAi(s, at);
    } catch {
      return null;
    }
    at += ai.length;
    const predefined = PREDEFINED_LENGTH[ai.slice(0, 2)];
    let value: string;
    if (predefined !== undefined) {
      value = s.slice(at, at + predefined - ai.length);
      if (value.length !== predefined - ai.length || !/^\d+$/.test(value)) return null;
      at += value.length;
    } else {
      const end = s.indexOf(GS, at);
      value = end === -1 ? s.slice(at) : s.slice(at, end);
      at = end === -1 ? s.length : end + 1;
    }
    if (value === '') return null;
    ais.push(ai);
  }
  return ais;
}

/**
 * Cheap check whether a scanned text is meant as GS1 data (it may still be invalid, and then
 * parseGs1 says which field is wrong). Without brackets, a GS or a GS1 symbology identifier, a
 * digit string counts when it starts with a GTIN or SSCC, or when it splits into two or more
 * known AIs in any order (e.g. `17…` + `01…` + `10…`).
 */
export function looksLikeGs1(input: string): boolean {
  const trimmed = (input ?? '').trim();
  if (trimmed === '') return false;
  const { id, data: s } = splitSymbologyId(trimmed);
  if (id && GS1_SYMBOLOGY_IDS.has(id)) return true;
  if (s === '') return false;
  if (/^https?:\/\//i.test(s)) return /\/(01\/\d{8,14}|00\/\d{18})(?:[/?#]|$)/.test(s);
  if (/^\(\d{2,4}\)/.test(s)) return true;
  if (s.includes(GS)) return true;
  if (/^(01\d{14}|00\d{18})/.test(s)) return true;
  const ais = rawAiSequence(s);
  return ais !== null && ais.length >= 2;
}

function encodeDl(value: string): string {
  // Everything outside the URI unreserved set is percent-encoded (GS1 Digital Link URI syntax).
  return Array.from(new TextEncoder().encode(value))
    .map((b) => {
      const c = String.fromCharCode(b);
      return /[A-Za-z0-9\-._~]/.test(c) ? c : `%${b.toString(16).toUpperCase().padStart(2, '0')}`;
    })
    .join('');
}

function checkGtinArg(gtin: string): void {
  if (!/^\d+$/.test(gtin) || ![8, 12, 13, 14].includes(gtin.length)) {
    throw new Gs1Error('gtin', 'GTIN must be 8, 12, 13 or 14 digits', '01');
  }
  verifyCheckDigit(gtin, 'gtin', 'GTIN', '01');
}

/**
 * Build a GS1 Digital Link URI: `{domain}/01/{gtin14}/10/{lot}/21/{serial}?17={yymmdd}`.
 * `domain` may be a bare host (`id.example.org`) or a base URL with a path prefix.
 */
export function toDigitalLink(
  parts: { gtin: string; lot?: string; serial?: string; expiresOn?: string },
  domain = 'https://id.gs1.org',
): string {
  checkGtinArg(parts.gtin);
  const base = (/^https?:\/\//i.test(domain) ? domain : `https://${domain}`).replace(/\/+$/, '');
  try {
    new URL(base);
  } catch {
    throw new Gs1Error('domain', `"${domain}" is not a usable domain`);
  }
  const now = new Date();
  let uri = `${base}/01/${parts.gtin.padStart(14, '0')}`;
  if (parts.lot !== undefined) uri += `/10/${encodeDl(checkElement('10', parts.lot, now).value)}`;
  if (parts.serial !== undefined) uri += `/21/${encodeDl(checkElement('21', parts.serial, now).value)}`;
  if (parts.expiresOn !== undefined) uri += `?17=${toGs1Date(parts.expiresOn)}`;
  return uri;
}

/** Human-readable element string `(01)…(17)…(10)…` for the text beside a code. */
export function toElementString(parts: { gtin: string; lot?: string; serial?: string; expiresOn?: string }): string {
  checkGtinArg(parts.gtin);
  const now = new Date();
  let s = `(01)${parts.gtin.padStart(14, '0')}`;
  if (parts.expiresOn !== undefined) s += `(17)${toGs1Date(parts.expiresOn)}`;
  if (parts.lot !== undefined) s += `(10)${checkElement('10', parts.lot, now).value}`;
  if (parts.serial !== undefined) s += `(21)${checkElement('21', parts.serial, now).value}`;
  return s;
}
