import { eq } from 'drizzle-orm';
import { db } from '../../db/client';
import { lots, materials } from '../../db/schema';
import { conflict, fieldError, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { LOT_TRANSITIONS, type Lot } from '../../../shared/schemas/lots';
import { toLot } from './present';
import { lotStatusWords } from '../../../shared/words';

/**
 * Quality's decision on a lot: release, quarantine or reject (LOT_TRANSITIONS). A reason is
 * required to quarantine, to reject and to lift a quarantine. Audited with who, when, old and
 * new status and the reason (21 CFR 11.10(e)); the order of steps is enforced (§11.10(f)).
 */
export async function changeLotStatus(
  actor: Actor,
  id: string,
  input: { status: 'released' | 'quarantined' | 'rejected'; reason: string | null },
): Promise<{ lot: Lot }> {
  requirePermission(actor, 'lots.release');
  return db.transaction(async (tx) => {
    const [lot] = await tx.select().from(lots).where(eq(lots.id, id)).for('update');
    if (!lot) throw notFound('The lot');
    const allowed = LOT_TRANSITIONS[lot.status];
    if (!allowed.includes(input.status)) {
      const now = lotStatusWords(lot.status).toLowerCase();
      const msg =
        allowed.length === 0
          ? `The lot is ${now}; that is final and its status cannot change.`
          : `The lot is ${now}; it can be set to ${allowed.map((s) => lotStatusWords(s).toLowerCase()).join(' or ')}, not ${lotStatusWords(input.status).toLowerCase()}.`;
      throw conflict('INVALID_TRANSITION', msg, { from: lot.status, to: input.status, allowed });
    }
    if (lot.status === 'quarantined' && input.status === 'released' && !input.reason) {
      throw fieldError('reason', 'is required to lift a quarantine');
    }
    const now = new Date();
    const [updated] = await tx
      .update(lots)
      .set({ status: input.status, statusReason: input.reason, statusChangedAt: now, statusChangedBy: actor.id })
      .where(eq(lots.id, id))
      .returning();
    await recordAudit(tx, {
      actorId: actor.id,
      action: 'lot.status',
      entityType: 'lot',
      entityId: id,
      before: { status: lot.status, statusReason: lot.statusReason },
      after: { status: updated.status, statusReason: updated.statusReason },
      reason: input.reason,
    });
    const [material] = await tx.select().from(materials).where(eq(materials.id, lot.materialId));
    return { lot: toLot(updated, material) };
  });
}
