/**
 * Two-part pairs: an adhesive (resin) and its hardener or activator point at each other.
 * Linking A to B also links B to A; unlinking or re-pairing clears the old partner's link.
 */
import { eq } from 'drizzle-orm';
import type { Tx } from '../../db/client';
import { materials } from '../../db/schema';
import { conflict, fieldError } from '../../errors';
import type { Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import { CURING_AGENT_KINDS } from '../../../shared/schemas/materials';
import type { MaterialKind } from '../../../shared/constants';
import type { MaterialRow } from './materials-read';

export function checkPairKinds(kind: MaterialKind, partnerKind: MaterialKind): void {
  const ok =
    (kind === 'adhesive' && CURING_AGENT_KINDS.includes(partnerKind)) || (CURING_AGENT_KINDS.includes(kind) && partnerKind === 'adhesive');
  if (!ok) {
    throw fieldError(
      'partnerMaterialId',
      `must pair an adhesive with a hardener or activator (this is ${kind}, the partner is ${partnerKind})`,
    );
  }
}

async function lockRow(tx: Tx, id: string): Promise<MaterialRow | undefined> {
  const [row] = await tx.select().from(materials).where(eq(materials.id, id)).for('update');
  return row;
}

async function setPartner(tx: Tx, actor: Actor, row: MaterialRow, partnerId: string | null): Promise<void> {
  await tx.update(materials).set({ partnerMaterialId: partnerId, updatedAt: new Date() }).where(eq(materials.id, row.id));
  await recordAudit(tx, {
    actorId: actor.id,
    action: 'material.partner',
    entityType: 'material',
    entityId: row.id,
    before: { partnerMaterialId: row.partnerMaterialId },
    after: { partnerMaterialId: partnerId },
  });
}

/**
 * Checks the partner a material is about to have (call before writing the material).
 * Returns the partner row, or null for no partner.
 */
export async function checkPartner(
  tx: Tx,
  selfId: string | null,
  kind: MaterialKind,
  partnerId: string | null,
  changed: boolean,
): Promise<MaterialRow | null> {
  if (!partnerId) return null;
  if (partnerId === selfId) throw fieldError('partnerMaterialId', 'must be a different material');
  const partner = await lockRow(tx, partnerId);
  if (!partner) throw fieldError('partnerMaterialId', 'is not a material in the catalogue');
  checkPairKinds(kind, partner.kind);
  if (changed) {
    if (!partner.active) throw fieldError('partnerMaterialId', `is retired (${partner.code}); reinstate it first`);
    if (partner.partnerMaterialId && partner.partnerMaterialId !== selfId) {
      throw conflict('PARTNER_TAKEN', `${partner.code} is already the mix partner of another material; unlink it there first.`, [
        { field: 'partnerMaterialId', message: 'is already paired with another material' },
      ]);
    }
  }
  return partner;
}

/**
 * Makes the pair mutual after `self` was written with partner `newId` (previously `oldId`).
 */
export async function relinkPartners(tx: Tx, actor: Actor, self: MaterialRow, oldId: string | null, newId: string | null): Promise<void> {
  if (oldId === newId) return;
  if (oldId) {
    const old = await lockRow(tx, oldId);
    if (old && old.partnerMaterialId === self.id) {
      if (old.potLifeMinutes) {
        throw conflict(
          'PARTNER_STILL_NEEDED',
          `${old.code} has a pot life and needs its mix partner; remove its pot life or give it another partner first.`,
          [{ field: 'partnerMaterialId', message: `${old.code} still needs this material as its partner` }],
        );
      }
      await setPartner(tx, actor, old, null);
    }
  }
  if (newId) {
    const partner = await lockRow(tx, newId);
    if (partner && partner.partnerMaterialId !== self.id) await setPartner(tx, actor, partner, self.id);
  }
}
