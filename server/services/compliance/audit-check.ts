import { eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { settings } from '../../db/schema';
import { verifyAuditChain } from '../audit-chain';
import type { Finding } from './findings';

/** The watch walks the whole audit chain at most once in this many hours. */
const VERIFY_EVERY_HOURS = 24;
const LAST_CHECK_KEY = 'auditChainLastCheck';

interface LastCheck {
  at: string;
  ok: boolean;
  checked: number;
  firstBroken: { id: number; at: string; problem: string } | null;
}

function finding(check: LastCheck): Finding[] {
  if (check.ok || !check.firstBroken) return [];
  const b = check.firstBroken;
  return [
    {
      kind: 'audit_chain_broken',
      severity: 'critical',
      subjectType: 'audit_entry',
      subjectId: String(b.id),
      audience: ['quality', 'admin'],
      message: `The audit trail no longer verifies: entry ${b.id} ${b.problem}. Find out who changed the database directly, and keep a copy of it before anything else changes.`,
      data: { firstBrokenId: b.id, firstBrokenAt: b.at, problem: b.problem, checkedAt: check.at, intactBefore: check.checked },
    },
  ];
}

/**
 * Daily verification of the audit chain by the compliance watch: a broken chain raises a
 * critical alert for quality and admin (it stays until a person resolves it).
 */
export async function auditChainBroken(tx: DbOrTx, now: Date): Promise<Finding[]> {
  const [row] = await tx.select({ value: settings.value }).from(settings).where(eq(settings.key, LAST_CHECK_KEY));
  const last = row?.value as LastCheck | undefined;
  if (last && now.getTime() - new Date(last.at).getTime() < VERIFY_EVERY_HOURS * 3_600_000) return finding(last);
  const result = await verifyAuditChain(tx);
  const check: LastCheck = { at: now.toISOString(), ...result };
  await tx
    .insert(settings)
    .values({ key: LAST_CHECK_KEY, value: check })
    .onConflictDoUpdate({ target: settings.key, set: { value: check, updatedAt: sql`now()` } });
  return finding(check);
}
