import type { DigestRunResult } from '../../../shared/schemas/notifications';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import { db } from '../../db/client';
import { drainOutbox } from '../mail/worker';
import { queueDigests } from './digest';

/**
 * POST /api/notifications/digest: queues today's digests that are not queued yet and hands
 * them to the mail server at once (what is not delivered now, the worker retries).
 */
export async function sendDigestsNow(actor: Actor): Promise<DigestRunResult> {
  requirePermission(actor, 'notifications.sendDigest');
  const run = await queueDigests();
  await recordAudit(db, { actorId: actor.id, action: 'notifications.digest', entityType: 'digest', entityId: run.plantDate, after: { queued: run.queued } });
  const delivered = run.ids.length ? await drainOutbox({ only: run.ids }) : { sent: 0, recovered: 0 };
  return { sent: run.queued, plantDate: run.plantDate, delivered: delivered.sent + delivered.recovered };
}
