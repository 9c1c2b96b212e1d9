/**
 * Whether a container or a mix may be used now: the checks behind every station refusal
 * (loading, mixing, step start). Pure given the rows; throws a 409 with the reason code.
 */
import type { containers, lots, materials, mixes } from '../../db/schema';
import { conflict } from '../../errors';
import { earliestOf, isExpired, lotExpiry, type ExpiryCause, type ExpiryResult } from '../../../shared/expiry';
import { containerExpiryOf, expiryLotOf, expiryMaterialOf, PLANT_ZONE } from '../lots/present';
import { plantTime } from '../../plant-time';

export type ContainerRow = typeof containers.$inferSelect;
export type LotRow = typeof lots.$inferSelect;
export type MaterialRow = typeof materials.$inferSelect;
export type MixRow = typeof mixes.$inferSelect;

export { PLANT_ZONE };

const CAUSE_WORDS: Record<ExpiryCause, string> = {
  supplier_expiry: "the supplier's expiry date",
  shelf_life: 'its shelf life',
  open_life: 'its after-opening life',
  thawed_life: 'its allowed life after thawing',
  out_of_storage: 'its allowed time out of cold storage',
  pot_life: 'its pot life',
};

export function causeWords(cause: ExpiryCause): string {
  return CAUSE_WORDS[cause];
}

/** A refusal names the moment in plant time ("since 07:25", "since Thu 07:25"). */
function when(iso: string): string {
  return plantTime(iso);
}

/** Effective expiry of a container (a sealed one being loaded is judged as it is now: unopened). */
export function expiryOfContainer(c: ContainerRow, l: LotRow, m: MaterialRow, now: Date): ExpiryResult {
  return containerExpiryOf(c, l, m, now, PLANT_ZONE);
}

/** Effective expiry of a mix: its pot-life end (set at mixing), or an earlier lot limit of a part. */
export function expiryOfMix(mix: MixRow, parts: { lot: LotRow; material: MaterialRow }[]): ExpiryResult {
  const lotLimits = parts.map((p) => lotExpiry(expiryMaterialOf(p.material), expiryLotOf(p.lot), PLANT_ZONE));
  return earliestOf([
    { cause: 'pot_life', at: mix.potLifeEndsAt.toISOString() },
    ...lotLimits.flatMap((r) => (r.at && r.cause ? [{ cause: r.cause, at: r.at }] : [])),
  ]);
}

/** Refuses a lot that is not released. */
export function checkLotStatus(lot: LotRow, material: MaterialRow, what: string): void {
  const name = `${material.name} lot ${lot.supplierLot}`;
  switch (lot.status) {
    case 'released':
      return;
    case 'on_hold':
      throw conflict(
        'LOT_ON_HOLD',
        `${what}: ${name} is on hold awaiting incoming inspection. Do not use it; load a released lot, or ask quality to release this one.`,
        { lotId: lot.id },
      );
    case 'quarantined':
      throw conflict(
        'LOT_QUARANTINED',
        `${what}: ${name} is quarantined by quality. Do not use it; take it off the line and load a released lot.`,
        { lotId: lot.id },
      );
    case 'rejected':
      throw conflict(
        'LOT_REJECTED',
        `${what}: ${name} was rejected by quality. Do not use it; take it off the line and load a released lot.`,
        { lotId: lot.id },
      );
    case 'used_up':
      throw conflict('CONTAINER_EMPTY', `${what}: ${name} is recorded as used up. Load a container from another lot.`, { lotId: lot.id });
  }
}

/** Refuses an empty, scrapped, held or expired container; returns its effective expiry. */
export function checkContainerUsable(c: ContainerRow, lot: LotRow, m: MaterialRow, now: Date): ExpiryResult {
  const what = `Container ${c.code}`;
  if (c.status === 'scrapped') {
    throw conflict('CONTAINER_SCRAPPED', `${what} (${m.name}) has been scrapped. Do not use it; load another container.`, {
      containerId: c.id,
    });
  }
  if (c.status === 'empty' || Number(c.remaining) <= 0) {
    throw conflict('CONTAINER_EMPTY', `${what} (${m.name}) is empty. Load another container of ${m.name}.`, { containerId: c.id });
  }
  checkLotStatus(lot, m, what);
  const expiry = expiryOfContainer(c, lot, m, now);
  if (isExpired(expiry, now) && expiry.at && expiry.cause) {
    const details = { containerId: c.id, expiredAt: expiry.at, cause: expiry.cause };
    if (expiry.cause === 'open_life') {
      throw conflict(
        'OPEN_LIFE_EXCEEDED',
        `${what} (${m.name}) is past its after-opening life (since ${when(expiry.at)}). Do not use it; put it aside for disposal and load a fresh container.`,
        details,
      );
    }
    throw conflict(
      'EXPIRED',
      `${what} (${m.name}) is past ${causeWords(expiry.cause)} (since ${when(expiry.at)}). Do not use it; put it aside for disposal and load another container.`,
      details,
    );
  }
  return expiry;
}

/** Refuses a discarded, used-up, held or pot-life-expired mix; returns its effective expiry. */
export function checkMixUsable(
  mix: MixRow,
  parts: { container: ContainerRow; lot: LotRow; material: MaterialRow }[],
  now: Date,
): ExpiryResult {
  const what = `Mix ${mix.code}`;
  if (mix.status === 'discarded') throw conflict('MIX_DISCARDED', `${what} has been discarded. Mix a fresh batch.`, { mixId: mix.id });
  if (mix.status === 'used_up' || Number(mix.remaining) <= 0) {
    throw conflict('CONTAINER_EMPTY', `${what} is used up. Mix a fresh batch.`, { mixId: mix.id });
  }
  for (const p of parts) checkLotStatus(p.lot, p.material, `${what} (from container ${p.container.code})`);
  const expiry = expiryOfMix(mix, parts);
  if (isExpired(expiry, now) && expiry.at && expiry.cause) {
    const details = { mixId: mix.id, expiredAt: expiry.at, cause: expiry.cause };
    if (expiry.cause === 'pot_life') {
      throw conflict(
        'POT_LIFE_EXCEEDED',
        `${what} is past its pot life (since ${when(expiry.at)}); it is starting to set. Do not use it; dispose of it as the SDS says and mix a fresh batch.`,
        details,
      );
    }
    throw conflict(
      'EXPIRED',
      `${what} contains material past ${causeWords(expiry.cause)} (since ${when(expiry.at)}). Do not use it; mix a fresh batch from other lots.`,
      details,
    );
  }
  return expiry;
}
