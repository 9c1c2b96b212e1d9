import { conflict } from '../../errors';
import type { RefusalCode } from '../../../shared/refusals';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { isExpired } from '../../../shared/expiry';
import type { ContainerResult } from '../../../shared/schemas/containers';
import { containerExpiryOf, type LotRow, type MaterialRow } from '../lots/present';
import { applyContainerAction, checkInUse, closeOutOfStorage } from './apply';
import { plantTime } from '../../plant-time';

const CAUSE_WORDS: Record<string, string> = {
  supplier_expiry: "the supplier's expiry date",
  shelf_life: 'its shelf life',
  open_life: 'its after-opening life',
  thawed_life: 'its allowed life after thawing',
  out_of_storage: 'its allowed time out of cold storage',
};

/** A refusal names the moment in plant time ("since 07:25", "since Thu 07:25"). */
function when(d: string): string {
  return d ? plantTime(d) : 'an unknown time';
}

/** Only a released lot may be opened (LOT_ON_HOLD, LOT_QUARANTINED, LOT_REJECTED, LOT_USED_UP otherwise). */
function checkReleased(lot: LotRow, material: MaterialRow): void {
  const name = `${material.name} lot ${lot.supplierLot}`;
  const refusals: Record<string, [RefusalCode, string]> = {
    on_hold: ['LOT_ON_HOLD', `${name} is on hold awaiting incoming inspection; ask quality to release it before opening a container.`],
    quarantined: ['LOT_QUARANTINED', `${name} is quarantined by quality; do not open it.`],
    rejected: ['LOT_REJECTED', `${name} was rejected by quality; do not open it.`],
    used_up: ['LOT_USED_UP', `${name} is recorded as used up.`],
  };
  const refusal = refusals[lot.status];
  if (refusal) throw conflict(refusal[0], refusal[1], { lotId: lot.id, status: lot.status });
}

/** Opens a sealed container: its after-opening life starts now. */
export async function openContainer(actor: Actor, id: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.handle');
  return applyContainerAction(actor, id, 'open', (ctx, now) => {
    const { container: c, lot, material } = ctx;
    checkInUse(ctx);
    if (c.status === 'open') {
      throw conflict('INVALID_TRANSITION', `Container ${c.code} is already open (since ${when(c.openedAt?.toISOString() ?? '')}).`, {
        containerId: c.id,
      });
    }
    checkReleased(lot, material);
    if (material.storageClass === 'frozen' && !c.thawedAt) {
      throw conflict('NOT_THAWED', `Container ${c.code} holds frozen material: record the end of its thaw before opening it.`, {
        containerId: c.id,
      });
    }
    const expiry = containerExpiryOf(c, lot, material, now);
    if (isExpired(expiry, now)) {
      throw conflict(
        'EXPIRED',
        `Container ${c.code} (${material.name}) is past ${CAUSE_WORDS[expiry.cause ?? ''] ?? 'its expiry'} (since ${when(expiry.at ?? '')}); do not open it. Put it aside for disposal as the SDS says.`,
        {
          containerId: c.id,
          expiredAt: expiry.at,
          cause: expiry.cause,
        },
      );
    }
    return { set: { status: 'open', openedAt: now } };
  });
}

export async function moveContainer(actor: Actor, id: string, location: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.handle');
  return applyContainerAction(actor, id, 'move', (ctx) => {
    checkInUse(ctx);
    return { set: { location } };
  });
}

/** Records a container as used to the end. */
export async function emptyContainer(actor: Actor, id: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.empty');
  return applyContainerAction(actor, id, 'empty', (ctx, now) => {
    checkInUse(ctx);
    return { set: { status: 'empty', remaining: '0', ...closeOutOfStorage(ctx.container, now) } };
  });
}

/** Takes a container out of use for a reason (damaged, expired, contaminated …); what was left stays recorded. */
export async function scrapContainer(actor: Actor, id: string, reason: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.scrap');
  return applyContainerAction(actor, id, 'scrap', (ctx, now) => {
    checkInUse(ctx);
    return { set: { status: 'scrapped', ...closeOutOfStorage(ctx.container, now) }, reason };
  });
}
