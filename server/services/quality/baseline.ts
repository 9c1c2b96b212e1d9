import { eq, sql } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { settings } from '../../db/schema';
import type { Baseline, BaselineOverrideInput } from '../../../shared/schemas/quality';
import { requirePermission, type Actor } from '../auth/actor';
import { recordAudit } from '../audit';
import { readSetting } from '../settings';

const OVERRIDE_KEY = 'baselineOverride';

interface OverrideJson {
  rate: number;
  reason: string;
  by: string;
  at: string;
}

/**
 * The plant's baseline failure rate at final test, which lots are judged against: a quality
 * engineer's override when one is recorded; otherwise the share of drivers tested in the last
 * `baselineWindowDays` that failed; with fewer than `baselineMinTested` tested there, the
 * plant default (`baselineFailureRate`).
 */
export async function plantBaseline(tx: DbOrTx = db, now = new Date()): Promise<Baseline> {
  const windowDays = await readSetting('baselineWindowDays', tx);
  const minTested = await readSetting('baselineMinTested', tx);
  const from = new Date(now.getTime() - windowDays * 86_400_000);
  const [counts] = (
    await tx.execute<{ tested: number; failed: number }>(sql`
      SELECT count(*)::int AS tested, count(*) FILTER (WHERE failed)::int AS failed
      FROM (
        SELECT t.driver_id, bool_or(t.result = 'fail') AS failed
        FROM test_results t
        WHERE t.tested_at >= ${from} AND t.tested_at < ${now}
        GROUP BY t.driver_id
      ) d`)
  ).rows;
  const [row] = await tx.select({ value: settings.value }).from(settings).where(eq(settings.key, OVERRIDE_KEY));
  const override = (row?.value ?? null) as OverrideJson | null;
  const base = { tested: counts.tested, failed: counts.failed, from: from.toISOString(), to: now.toISOString() };
  if (override && typeof override.rate === 'number')
    return { ...base, rate: override.rate, overridden: true, override, source: 'override' };
  if (counts.tested >= minTested && counts.failed > 0) {
    return { ...base, rate: counts.failed / counts.tested, overridden: false, override: null, source: 'window' };
  }
  return { ...base, rate: await readSetting('baselineFailureRate', tx), overridden: false, override: null, source: 'default' };
}

/** POST /api/quality/baseline: set the baseline by hand with a reason, or clear the override. Audited. */
export async function overrideBaseline(actor: Actor, input: BaselineOverrideInput): Promise<Baseline> {
  requirePermission(actor, 'quality.overrideBaseline');
  return db.transaction(async (tx) => {
    const before = await plantBaseline(tx);
    if (input.rate === null) {
      await tx.delete(settings).where(eq(settings.key, OVERRIDE_KEY));
    } else {
      const value: OverrideJson = { rate: input.rate, reason: input.reason, by: actor.name, at: new Date().toISOString() };
      await tx
        .insert(settings)
        .values({ key: OVERRIDE_KEY, value, updatedBy: actor.id })
        .onConflictDoUpdate({ target: settings.key, set: { value, updatedBy: actor.id, updatedAt: sql`now()` } });
    }
    const after = await plantBaseline(tx);
    await recordAudit(tx, {
      actorId: actor.id,
      action: input.rate === null ? 'baseline.clearOverride' : 'baseline.override',
      entityType: 'setting',
      entityId: OVERRIDE_KEY,
      before: { rate: before.rate, source: before.source },
      after: { rate: after.rate, source: after.source },
      reason: input.reason,
    });
    return after;
  });
}
