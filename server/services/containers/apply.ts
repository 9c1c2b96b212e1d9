/**
 * The frame every container action runs in: lock the container and its lot, let the action
 * decide (or refuse with a 409), write the change, audit old and new values, and mark the lot
 * used up when its last container is emptied or scrapped.
 */
import { and, eq, inArray, sql } from 'drizzle-orm';
import { db, type Tx } from '../../db/client';
import { containers, lots } from '../../db/schema';
import { conflict } from '../../errors';
import type { Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import type { ContainerResult } from '../../../shared/schemas/containers';
import { toContainer, type ContainerRow, type LotRow } from '../lots/present';
import { loadContainer, type ContainerContext } from './load';

export type ContainerChange = Partial<
  Pick<ContainerRow, 'status' | 'openedAt' | 'thawedAt' | 'location' | 'remaining' | 'outOfStorageMinutes' | 'outOfStorageSince'>
>;

export interface Decision {
  set: ContainerChange;
  reason?: string | null;
}

const plain = (v: unknown) => (v instanceof Date ? v.toISOString() : v);

/** Refuses an action on a container that is out of use. */
export function checkInUse({ container, material }: ContainerContext): void {
  if (container.status === 'empty') {
    throw conflict('CONTAINER_EMPTY', `Container ${container.code} (${material.name}) is recorded as empty.`, {
      containerId: container.id,
    });
  }
  if (container.status === 'scrapped') {
    throw conflict('CONTAINER_SCRAPPED', `Container ${container.code} (${material.name}) has been scrapped.`, {
      containerId: container.id,
    });
  }
}

/** Closes a running out-of-storage period (when a container is emptied or scrapped while out). */
export function closeOutOfStorage(c: ContainerRow, now: Date): ContainerChange {
  if (!c.outOfStorageSince) return {};
  const minutes = Math.ceil((now.getTime() - c.outOfStorageSince.getTime()) / 60_000);
  return { outOfStorageMinutes: c.outOfStorageMinutes + Math.max(0, minutes), outOfStorageSince: null };
}

async function markUsedUpIfLast(tx: Tx, actor: Actor, lot: LotRow, now: Date): Promise<void> {
  if (lot.status !== 'released') return;
  const [{ n }] = await tx
    .select({ n: sql<number>`count(*)::int` })
    .from(containers)
    .where(and(eq(containers.lotId, lot.id), inArray(containers.status, ['sealed', 'open'])));
  if (Number(n) > 0) return;
  const reason = 'Every container of the lot is empty or scrapped.';
  await tx
    .update(lots)
    .set({ status: 'used_up', statusReason: reason, statusChangedAt: now, statusChangedBy: actor.id })
    .where(eq(lots.id, lot.id));
  await recordAudit(tx, {
    actorId: actor.id,
    action: 'lot.status',
    entityType: 'lot',
    entityId: lot.id,
    before: { status: lot.status },
    after: { status: 'used_up' },
    reason,
  });
}

export async function applyContainerAction(
  actor: Actor,
  id: string,
  action: string,
  decide: (ctx: ContainerContext, now: Date) => Decision,
): Promise<ContainerResult> {
  return db.transaction(async (tx) => {
    const ctx = await loadContainer(tx, id, true);
    const now = new Date();
    const { set, reason } = decide(ctx, now);
    const [updated] = await tx
      .update(containers)
      .set({ ...set, updatedAt: now })
      .where(eq(containers.id, id))
      .returning();
    const keys = Object.keys(set) as (keyof ContainerChange)[];
    await recordAudit(tx, {
      actorId: actor.id,
      action: `container.${action}`,
      entityType: 'container',
      entityId: id,
      before: Object.fromEntries(keys.map((k) => [k, plain(ctx.container[k])])),
      after: Object.fromEntries(keys.map((k) => [k, plain(updated[k])])),
      reason: reason ?? null,
    });
    if (set.status === 'empty' || set.status === 'scrapped') await markUsedUpIfLast(tx, actor, ctx.lot, now);
    return { container: toContainer(updated, ctx.lot, ctx.material, now) };
  });
}
