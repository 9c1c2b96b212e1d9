/**
 * Effective expiry of lots, containers and mixes (product brief, "What Tacklog computes", point 1).
 *
 * Each rule gives a candidate instant; the effective expiry is the earliest candidate. `at` is the
 * first instant at which the material may no longer be used: it is expired when now ≥ at.
 *
 * Choices, stated precisely:
 *  - Supplier expiry date (a date printed on a label) is usable through that whole day in the
 *    plant's zone: it expires at the start of the next day in that zone (default zone 'UTC').
 *  - Shelf life is counted from the manufacture date when known: start of that day in the zone plus
 *    shelfLifeDays calendar days (usable for exactly shelfLifeDays days; 2025-01-01 + 30 days
 *    expires at 2025-01-31 00:00). Without a manufacture date it is counted from the received
 *    instant plus shelfLifeDays calendar days in the zone.
 *  - After-opening life: openedAt + openLifeHours. Thawed life: thawedAt + thawedLifeHours.
 *  - Out-of-storage allowance (refrigerated or frozen material with an allowance): time out of cold
 *    storage adds up over a container's life. If the container is out now (outOfStorageSince set)
 *    it expires at since + (allowance − minutes already used before). If it is back in storage and
 *    the minutes used reach the allowance, it is expired; the exact moment is not known from the
 *    total alone, so `now` is used. In storage with allowance left, this rule gives no candidate.
 *  - Pot life applies to mixes: mixedAt + potLifeMinutes (temperature-adjusted minutes may be
 *    passed in; see shared/cure.ts).
 * Pure functions; luxon for calendar arithmetic.
 */
import { DateTime, Duration } from 'luxon';
import { checkZone, instant, nonNegative, startOfDate, toIso } from './time';

export interface ExpiryMaterial {
  shelfLifeDays: number | null;
  openLifeHours: number | null;
  thawedLifeHours: number | null;
  outOfStorageAllowanceHours: number | null;
  potLifeMinutes: number | null;
  storageClass: 'ambient' | 'refrigerated' | 'frozen';
}

export interface ExpiryLot {
  /** ISO instant */
  receivedAt: string;
  /** YYYY-MM-DD */
  manufacturedOn?: string | null;
  /** YYYY-MM-DD, the supplier's expiry date */
  expiresOn?: string | null;
}

export interface ExpiryContainer {
  openedAt?: string | null;
  thawedAt?: string | null;
  /** minutes out of cold storage already counted (closed periods) */
  outOfStorageMinutes?: number;
  /** set while the container is out of cold storage now */
  outOfStorageSince?: string | null;
}

export type ExpiryCause = 'supplier_expiry' | 'shelf_life' | 'open_life' | 'thawed_life' | 'out_of_storage' | 'pot_life';

export interface ExpiryCandidate {
  cause: ExpiryCause;
  at: string;
}

export interface ExpiryResult {
  /** ISO instant of the earliest candidate, or null when nothing limits the material */
  at: string | null;
  cause: ExpiryCause | null;
  /** every rule that applies, earliest first */
  candidates: ExpiryCandidate[];
}

/** Combine candidates: the earliest wins; ties keep the order given. */
export function earliestOf(candidates: ExpiryCandidate[]): ExpiryResult {
  const sorted = candidates
    .map((c, i) => ({ c, i, t: Date.parse(c.at) }))
    .sort((a, b) => a.t - b.t || a.i - b.i)
    .map(({ c }) => c);
  const first = sorted[0];
  return { at: first?.at ?? null, cause: first?.cause ?? null, candidates: sorted };
}

function lotCandidates(material: ExpiryMaterial, lot: ExpiryLot, zone: string): ExpiryCandidate[] {
  checkZone(zone);
  const out: ExpiryCandidate[] = [];
  const received = instant(lot.receivedAt, 'receivedAt');
  if (lot.expiresOn) {
    const end = startOfDate(lot.expiresOn, zone, 'expiresOn').plus({ days: 1 });
    out.push({ cause: 'supplier_expiry', at: toIso(end) });
  }
  if (material.shelfLifeDays !== null && material.shelfLifeDays !== undefined) {
    const days = nonNegative(material.shelfLifeDays, 'shelfLifeDays');
    const from = lot.manufacturedOn ? startOfDate(lot.manufacturedOn, zone, 'manufacturedOn') : received.setZone(zone);
    out.push({ cause: 'shelf_life', at: toIso(from.plus({ days })) });
  }
  return out;
}

/** Expiry of a lot as received (sealed): supplier expiry and shelf life. */
export function lotExpiry(material: ExpiryMaterial, lot: ExpiryLot, zone = 'UTC'): ExpiryResult {
  return earliestOf(lotCandidates(material, lot, zone));
}

function plusHours(iso: string, hours: number, what: string): string {
  return toIso(instant(iso, what).plus(Duration.fromObject({ milliseconds: Math.round(hours * 3_600_000) })));
}

/** Expiry of one container: its lot's limits plus after-opening, thawed and out-of-storage time. */
export function containerExpiry(
  material: ExpiryMaterial,
  lot: ExpiryLot,
  container: ExpiryContainer,
  zone = 'UTC',
  now: Date = new Date(),
): ExpiryResult {
  const out = lotCandidates(material, lot, zone);
  if (container.openedAt && material.openLifeHours !== null && material.openLifeHours !== undefined) {
    const hours = nonNegative(material.openLifeHours, 'openLifeHours');
    out.push({ cause: 'open_life', at: plusHours(container.openedAt, hours, 'openedAt') });
  }
  if (container.thawedAt && material.thawedLifeHours !== null && material.thawedLifeHours !== undefined) {
    const hours = nonNegative(material.thawedLifeHours, 'thawedLifeHours');
    out.push({ cause: 'thawed_life', at: plusHours(container.thawedAt, hours, 'thawedAt') });
  }
  const allowanceHours = material.outOfStorageAllowanceHours;
  if (allowanceHours !== null && allowanceHours !== undefined && material.storageClass !== 'ambient') {
    const allowanceMin = nonNegative(allowanceHours, 'outOfStorageAllowanceHours') * 60;
    const usedMin = nonNegative(container.outOfStorageMinutes ?? 0, 'outOfStorageMinutes');
    if (container.outOfStorageSince) {
      const since = instant(container.outOfStorageSince, 'outOfStorageSince');
      const at = since.plus({ milliseconds: Math.round((allowanceMin - usedMin) * 60_000) });
      out.push({ cause: 'out_of_storage', at: toIso(at) });
    } else if (usedMin >= allowanceMin) {
      out.push({ cause: 'out_of_storage', at: toIso(DateTime.fromJSDate(now)) });
    }
  }
  return earliestOf(out);
}

/** Expired when now is at or past the effective expiry. Nothing limits a null expiry. */
export function isExpired(result: ExpiryResult, now: Date): boolean {
  return result.at !== null && now.getTime() >= Date.parse(result.at);
}

/**
 * First-expiry-first-out order: earliest effective expiry first, no expiry last, ties by received
 * instant, then by sequence number. Returns a new array.
 */
export function fefoOrder<T extends { expiry: string | null; receivedAt: string; seq: number }>(items: T[]): T[] {
  const key = (iso: string | null) => (iso === null ? Number.POSITIVE_INFINITY : Date.parse(iso));
  return [...items].sort((a, b) => key(a.expiry) - key(b.expiry) || Date.parse(a.receivedAt) - Date.parse(b.receivedAt) || a.seq - b.seq);
}
