import { isDeepStrictEqual } from 'node:util';
import { eq, ne, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { alerts } from '../../db/schema';
import { queueAlertMails, queueAlertResolvedMails } from '../notifications/alert-mail';
import { mailQueued } from '../mail/worker';
import type { Actor } from '../auth/actor';
import { requirePermission } from '../auth/actor';
import { recordAudit } from '../audit';
import type { ComplianceRunResult } from '../../../shared/schemas/alerts';
import { ALL_CHECKS, type Finding } from './findings';

/** Advisory-lock key of the watch: only one server process sweeps at a time. */
const WATCH_LOCK = 7226002;

/** Kinds that clear by themselves when their condition goes; the others wait for a person. */
const SELF_CLEARING = new Set([
  'pot_life_exceeded',
  'expired_in_stock',
  'expiring_soon',
  'quarantine_advised',
  'below_reorder_point',
  'lamp_check_due',
]);

const keyOf = (f: { kind: string; subjectType: string; subjectId: string }) => `${f.kind}|${f.subjectType}|${f.subjectId}`;

/** What an alert row keeps of a finding: the figures, and the detail line beside them. */
const dataOf = (f: Finding): Record<string, unknown> | null =>
  f.data || f.detail ? { ...(f.data ?? {}), ...(f.detail ? { detail: f.detail } : {}) } : null;

/**
 * One sweep of the compliance watch: raises an alert for every new finding (never a duplicate:
 * one live alert per kind and subject), resolves self-clearing alerts whose finding has gone,
 * and queues e-mail for what it raised (one per subscriber, in the same transaction, under a
 * once-only key per alert and recipient). Runs in one transaction under a PostgreSQL advisory
 * lock, so with several server processes exactly one sweeps at a time; the others skip.
 */
export async function sweep(now = new Date()): Promise<ComplianceRunResult> {
  const result = await db.transaction(async (tx) => {
    const [{ locked }] = (await tx.execute<{ locked: boolean }>(sql`SELECT pg_try_advisory_xact_lock(${WATCH_LOCK}) AS locked`)).rows;
    if (!locked) return { raised: 0, resolved: 0, ran: false };

    // One connection carries the transaction: run the checks one after another.
    const findings: Finding[] = [];
    for (const check of ALL_CHECKS) findings.push(...(await check(tx, now)));
    const live = await tx.select().from(alerts).where(ne(alerts.state, 'resolved'));
    const liveKeys = new Map(live.map((a) => [keyOf(a), a]));
    const found = new Set(findings.map(keyOf));

    let raised = 0;
    for (const f of findings) {
      const existing = liveKeys.get(keyOf(f));
      if (existing) {
        // Keep the wording current (counts and times change) without raising it again.
        if (existing.message !== f.message || !isDeepStrictEqual(existing.data ?? null, dataOf(f))) {
          await tx
            .update(alerts)
            .set({ message: f.message, data: dataOf(f), severity: f.severity })
            .where(eq(alerts.id, existing.id));
        }
        continue;
      }
      const [row] = await tx
        .insert(alerts)
        .values({
          kind: f.kind,
          severity: f.severity,
          subjectType: f.subjectType,
          subjectId: f.subjectId,
          message: f.message,
          audience: f.audience,
          data: dataOf(f),
          raisedAt: now,
        })
        .onConflictDoNothing()
        .returning();
      if (!row) continue;
      raised += 1;
      await recordAudit(tx, {
        actorId: null,
        action: 'alert.raise',
        entityType: 'alert',
        entityId: row.id,
        after: { kind: f.kind, subjectType: f.subjectType, subjectId: f.subjectId },
      });
      await queueAlertMails(tx, row);
    }

    let resolved = 0;
    for (const a of live) {
      if (!SELF_CLEARING.has(a.kind) || found.has(keyOf(a))) continue;
      const resolution = 'The condition no longer holds (cleared by the compliance watch).';
      await tx.update(alerts).set({ state: 'resolved', resolvedAt: now, resolution }).where(eq(alerts.id, a.id));
      await queueAlertResolvedMails(tx, a, resolution, now, null);
      await recordAudit(tx, {
        actorId: null,
        action: 'alert.clear',
        entityType: 'alert',
        entityId: a.id,
        before: { state: a.state },
        after: { state: 'resolved' },
      });
      resolved += 1;
    }
    return { raised, resolved, ran: true };
  });
  if (result.raised || result.resolved) mailQueued();
  return result;
}

/** POST /api/compliance/run: a person asks for a sweep now. */
export function runComplianceNow(actor: Actor): Promise<ComplianceRunResult> {
  requirePermission(actor, 'compliance.run');
  return sweep();
}
