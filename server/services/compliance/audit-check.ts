import type { DbOrTx } from '../../db/client';
import { verifyAuditChain } from '../audit-chain';
import { lastAuditCheck, recordAuditCheck } from '../audit-chain/last-check';
import type { AuditCheck } from '../../../shared/schemas/home';
import type { Finding } from './findings';

/** The watch walks the whole audit chain at most once in this many hours. */
const VERIFY_EVERY_HOURS = 24;

function finding(check: AuditCheck): Finding[] {
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
  const last = await lastAuditCheck(tx);
  if (last && now.getTime() - new Date(last.at).getTime() < VERIFY_EVERY_HOURS * 3_600_000) return finding(last);
  return finding(await recordAuditCheck(tx, await verifyAuditChain(tx), now));
}
