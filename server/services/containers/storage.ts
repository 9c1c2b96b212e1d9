import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import type { ContainerResult } from '../../../shared/schemas/containers';
import { applyContainerAction, checkInUse, closeOutOfStorage } from './apply';
import { plantTime } from '../../plant-time';

/** Frozen material: records the end of the thaw; its thawed life starts now. */
export async function thawContainer(actor: Actor, id: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.handle');
  return applyContainerAction(actor, id, 'thaw', (ctx, now) => {
    const { container: c, material } = ctx;
    if (material.storageClass !== 'frozen') {
      throw conflict('NOT_FROZEN', `${material.name} is not frozen material; there is no thaw to record.`, { containerId: c.id });
    }
    checkInUse(ctx);
    if (c.thawedAt)
      throw conflict(
        'ALREADY_THAWED',
        `Container ${c.code} was already thawed at ${plantTime(c.thawedAt)}; frozen material is not refrozen.`,
        { containerId: c.id },
      );
    return { set: { thawedAt: now } };
  });
}

function checkRefrigerated(ctx: Parameters<typeof checkInUse>[0]): void {
  if (ctx.material.storageClass !== 'refrigerated') {
    throw conflict('NOT_REFRIGERATED', `${ctx.material.name} is not refrigerated material; time out of storage is not counted for it.`, {
      containerId: ctx.container.id,
    });
  }
}

/** Refrigerated material: the container leaves cold storage; the time out counts against its allowance. */
export async function takeOutOfStorage(actor: Actor, id: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.handle');
  return applyContainerAction(actor, id, 'out_of_storage', (ctx, now) => {
    checkRefrigerated(ctx);
    checkInUse(ctx);
    const c = ctx.container;
    if (c.outOfStorageSince) {
      throw conflict(
        'ALREADY_OUT_OF_STORAGE',
        `Container ${c.code} is already out of cold storage (since ${plantTime(c.outOfStorageSince)}).`,
        { containerId: c.id },
      );
    }
    return { set: { outOfStorageSince: now } };
  });
}

/** Refrigerated material: back in cold storage; the minutes out (rounded up) are added to its total. */
export async function returnToStorage(actor: Actor, id: string): Promise<ContainerResult> {
  requirePermission(actor, 'containers.handle');
  return applyContainerAction(actor, id, 'return_to_storage', (ctx, now) => {
    checkRefrigerated(ctx);
    checkInUse(ctx);
    const c = ctx.container;
    if (!c.outOfStorageSince) {
      throw conflict('NOT_OUT_OF_STORAGE', `Container ${c.code} is not recorded as out of cold storage.`, { containerId: c.id });
    }
    return { set: closeOutOfStorage(c, now) };
  });
}
