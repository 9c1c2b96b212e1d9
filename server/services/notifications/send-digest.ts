import type { DigestRunResult } from '../../../shared/schemas/notifications';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { and, count, eq, inArray } from 'drizzle-orm';
import { db } from '../../db/client';
import { outgoingEmails } from '../../db/schema';
import { drainOutbox } from '../mail/worker';
import { queueDigests } from './digest';

/**
 * POST /api/notifications/digest: queues today's digests that are not queued yet and hands
 * them to the mail server at once (what is not delivered now, the worker retries).
 */
export async function sendDigestsNow(actor: Actor): Promise<DigestRunResult> {
  requirePermission(actor, 'notifications.sendDigest');
  const run = await queueDigests();
  await recordAudit(db, {
    actorId: actor.id,
    action: 'notifications.digest',
    entityType: 'digest',
    entityId: run.plantDate,
    after: { queued: run.queued },
  });
  if (run.ids.length) await drainOutbox({ only: run.ids });
  // This request's round or the process's worker (woken by the queueing) may have sent them.
  const delivered = run.ids.length
    ? (
        await db
          .select({ n: count() })
          .from(outgoingEmails)
          .where(and(inArray(outgoingEmails.id, run.ids), eq(outgoingEmails.status, 'sent')))
      )[0].n
    : 0;
  return { sent: run.queued, plantDate: run.plantDate, delivered };
}
