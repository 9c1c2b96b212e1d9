import { z } from 'zod';
import { CONTAINER_STATUSES, LOT_STATUSES } from '../constants';
import { idSchema, instantSchema } from './common';

/**
 * Containers (ISA-95 sublots): one labelled unit of a lot.
 *
 * ## Container code format
 *
 * `TLC-` + 8 symbols of a random 40-bit number in Crockford's Base32 + 1 check symbol,
 * e.g. `TLC-4D7QX2MB9`. Why:
 *  - short (13 characters) and typable: Crockford's alphabet (0-9, A-Z without I, L, O, U) has
 *    no look-alike letters; input is read case-insensitively and O→0, I/L→1, spaces dropped;
 *  - compact in a QR code: upper-case letters, digits and `-` use the QR alphanumeric mode
 *    (ISO/IEC 18004), so a code fits a version-1 symbol (21×21 modules) at error correction M;
 *  - typing mistakes are caught: the last symbol is a Luhn mod N check (N = 32) over the 8
 *    symbols before it, which detects every single-symbol error and most swaps of neighbours.
 * The QR on a container label carries exactly this code. `/api/scans/resolve` also accepts it
 * inside a URL (as the last path segment or a `c` query parameter, e.g. a GS1 Digital Link
 * `https://…/01/{gtin}/21/TLC-…`).
 */
export const CONTAINER_CODE_PREFIX = 'TLC-';
export const CROCKFORD_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
const BODY_LENGTH = 8;

/** Luhn mod N check symbol (N = 32, Crockford's alphabet) for a string of Crockford symbols. */
export function crockfordCheckSymbol(symbols: string): string {
  const n = CROCKFORD_ALPHABET.length;
  let factor = 2;
  let sum = 0;
  for (let i = symbols.length - 1; i >= 0; i--) {
    const codePoint = CROCKFORD_ALPHABET.indexOf(symbols[i]);
    if (codePoint < 0) throw new Error(`"${symbols[i]}" is not a Crockford Base32 symbol`);
    let addend = factor * codePoint;
    factor = factor === 2 ? 1 : 2;
    addend = Math.floor(addend / n) + (addend % n);
    sum += addend;
  }
  return CROCKFORD_ALPHABET[(n - (sum % n)) % n];
}

/** Upper-cases and maps look-alikes (O→0, I/L→1), drops spaces; does not validate. */
export function normalizeContainerCode(input: string): string {
  const s = input.trim().toUpperCase().replace(/\s+/g, '');
  const m = /^TLC-?(.*)$/.exec(s);
  if (!m) return s;
  return CONTAINER_CODE_PREFIX + m[1].replace(/O/g, '0').replace(/[IL]/g, '1');
}

/** True when the text (after normalizing) has the shape of a container code, whatever its check symbol. */
export function looksLikeContainerCode(input: string): boolean {
  return new RegExp(`^TLC-[${CROCKFORD_ALPHABET}]{${BODY_LENGTH + 1}}$`).test(normalizeContainerCode(input));
}

/** True when the text (after normalizing) is a container code with a correct check symbol. */
export function isValidContainerCode(input: string): boolean {
  if (!looksLikeContainerCode(input)) return false;
  const body = normalizeContainerCode(input).slice(CONTAINER_CODE_PREFIX.length);
  return crockfordCheckSymbol(body.slice(0, BODY_LENGTH)) === body[BODY_LENGTH];
}

/** Builds a container code from 8 Crockford symbols (the server draws them at random). */
export function containerCodeFromBody(body: string): string {
  if (body.length !== BODY_LENGTH) throw new Error(`a container code body has ${BODY_LENGTH} symbols`);
  return CONTAINER_CODE_PREFIX + body + crockfordCheckSymbol(body);
}

export const containerCodeSchema = z
  .string()
  .transform(normalizeContainerCode)
  .refine(looksLikeContainerCode, 'must be a container code like TLC-4D7QX2MB9')
  .refine(isValidContainerCode, 'has a wrong check symbol (last character): check for a typing mistake');

/** `:id` route parameter. */
export const containerParamsSchema = z.object({ id: idSchema });

export const containerStatusSchema = z.enum(CONTAINER_STATUSES);

export const containerSchema = z.object({
  id: idSchema,
  code: z.string(),
  lotId: idSchema,
  /** 1..N within the lot (label "container n of N"). */
  seq: z.number().int(),
  quantity: z.number(),
  remaining: z.number(),
  status: containerStatusSchema,
  openedAt: instantSchema.nullable(),
  /** Frozen material: when the thaw was finished. */
  thawedAt: instantSchema.nullable(),
  location: z.string().nullable(),
  /** Refrigerated material: minutes out of cold storage so far (a running period not included). */
  outOfStorageMinutes: z.number().int(),
  /** Set while the container is out of cold storage. */
  outOfStorageSince: instantSchema.nullable(),
  /** Earliest of all expiry limits that apply (shared/expiry.ts containerExpiry); null when none. */
  effectiveExpiry: instantSchema.nullable(),
  /** Which limit sets effectiveExpiry (e.g. supplier expiry, shelf life, after-opening life). */
  expiryCause: z.string().nullable(),
  createdAt: instantSchema,
  updatedAt: instantSchema,
});
export type Container = z.infer<typeof containerSchema>;

/** POST /api/containers/:id/location */
export const containerLocationInputSchema = z.object({
  location: z
    .string({ error: (i) => (i.input === undefined ? 'is required' : 'must be text') })
    .trim()
    .min(1, 'is required')
    .max(80, 'must be at most 80 characters'),
});
export type ContainerLocationInput = z.input<typeof containerLocationInputSchema>;

/** POST /api/containers/:id/scrap */
export const containerScrapInputSchema = z.object({
  reason: z
    .string({ error: (i) => (i.input === undefined ? 'is required' : 'must be text') })
    .trim()
    .min(3, 'is required (at least 3 characters)')
    .max(500, 'must be at most 500 characters'),
});
export type ContainerScrapInput = z.input<typeof containerScrapInputSchema>;

/** Every container action answers with the container as it is now. */
export const containerResultSchema = z.object({ container: containerSchema });
export type ContainerResult = z.infer<typeof containerResultSchema>;

/** A container in a first-expiry-first-out list, with what a picker needs to know of its lot. */
export const fefoEntrySchema = containerSchema.extend({
  supplierLot: z.string(),
  lotStatus: z.enum(LOT_STATUSES),
  lotReceivedAt: instantSchema,
});
export type FefoEntry = z.infer<typeof fefoEntrySchema>;

/**
 * GET /api/materials/:id/fefo: usable containers (lot released, not expired, not empty or
 * scrapped) first-expiry-first-out; `next` is the one to use next — an already open container
 * first when one is still usable ('open_first'), else the first in FEFO order ('earliest_expiry').
 */
export const fefoResultSchema = z.object({
  materialId: idSchema,
  items: z.array(fefoEntrySchema),
  next: fefoEntrySchema.nullable(),
  nextReason: z.enum(['open_first', 'earliest_expiry']).nullable(),
});
export type FefoResult = z.infer<typeof fefoResultSchema>;
