import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import type { HomeAdmin } from '../../../shared/schemas/home';
import { lastAuditCheck } from '../audit-chain/last-check';

/**
 * The administrator's day: active users, stations in use, and the audit chain's state as its
 * last verification found it (the watch's daily check or a person's Verify), with the entries
 * written since. The chain is not walked here: a home page must not read every audit row each
 * time it opens (the entries since the check are counted on the time index).
 */
export async function adminFigures(tx: DbOrTx): Promise<HomeAdmin> {
  const lastCheck = await lastAuditCheck(tx);
  const [row] = (
    await tx.execute<{
      users_active: number;
      users_total: number;
      stations_active: number;
      stations_total: number;
      since: number | null;
    }>(sql`
      SELECT (SELECT count(*) FILTER (WHERE active) FROM users)::int AS users_active,
             (SELECT count(*) FROM users)::int AS users_total,
             (SELECT count(*) FILTER (WHERE active) FROM stations)::int AS stations_active,
             (SELECT count(*) FROM stations)::int AS stations_total,
             ${lastCheck ? sql`(SELECT count(*) FROM audit_log WHERE at > ${new Date(lastCheck.at)})::int` : sql`NULL::int`} AS since`)
  ).rows;
  return {
    users: { active: row.users_active, total: row.users_total },
    stations: { active: row.stations_active, total: row.stations_total },
    auditChain: { lastCheck, sinceLastCheck: row.since },
  };
}
