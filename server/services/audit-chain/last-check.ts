import { eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { settings } from '../../db/schema';
import { auditCheckSchema, type AuditCheck } from '../../../shared/schemas/home';
import type { AuditVerifyResult } from '../../../shared/schemas/audit';

/** The settings row that keeps the last verification of the audit chain (by the watch or a person). */
export const LAST_CHECK_KEY = 'auditChainLastCheck';

/** The last verification of the audit chain; null before the first (or when the row is not readable). */
export async function lastAuditCheck(tx: DbOrTx): Promise<AuditCheck | null> {
  const [row] = await tx.select({ value: settings.value }).from(settings).where(eq(settings.key, LAST_CHECK_KEY));
  if (!row) return null;
  const parsed = auditCheckSchema.safeParse(row.value);
  return parsed.success ? parsed.data : null;
}

/** Keeps a verification's result as the chain's last check. */
export async function recordAuditCheck(tx: DbOrTx, result: AuditVerifyResult, at: Date): Promise<AuditCheck> {
  const check: AuditCheck = { at: at.toISOString(), ...result };
  await tx
    .insert(settings)
    .values({ key: LAST_CHECK_KEY, value: check })
    .onConflictDoUpdate({ target: settings.key, set: { value: check, updatedAt: sql`now()` } });
  return check;
}
