import crypto from 'node:crypto';
import { sql, type SQL } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db, type DbOrTx } from '../../db/client';
import type { AuditItem, AuditPage, AuditQuery, AuditVerifyResult } from '../../../shared/schemas/audit';
import { requirePermission, type Actor } from '../auth/actor';
import { config } from '../../config';
import { recordAuditCheck } from './last-check';

const BATCH = 5000;

type ChainRow = {
  id: string;
  at: Date | string;
  chain_seq: string | null;
  prev_hash: string | null;
  hash: string | null;
  canonical: string;
};

/**
 * Walks the audit chain in chain order and reports the first broken link: a row whose stored
 * hash is not SHA-256 of its canonical text (so a field was changed), whose previous-hash is
 * not the hash of the row before it (so a row was removed or inserted), or that was never
 * sealed. The canonical text comes from the same SQL function that sealed the row
 * (audit_log_canonical); the hashing here is node:crypto's, independent of the database's.
 */
export async function verifyAuditChain(tx: DbOrTx = db): Promise<AuditVerifyResult> {
  let checked = 0;
  let prev: string | null = null;
  let afterSeq = 0;
  const broken = (row: ChainRow, problem: string): AuditVerifyResult => ({
    ok: false,
    checked,
    firstBroken: { id: Number(row.id), at: new Date(row.at).toISOString(), problem },
  });

  // A row that was never sealed (written with the seal trigger off) breaks the chain too.
  const unsealed = (
    await tx.execute<ChainRow>(sql`
      SELECT a.id, a.at, a.chain_seq, a.prev_hash, a.hash, '' AS canonical
      FROM audit_log a WHERE a.chain_seq IS NULL OR a.hash IS NULL ORDER BY a.id LIMIT 1`)
  ).rows[0];

  for (;;) {
    const rows = (
      await tx.execute<ChainRow>(sql`
        SELECT a.id, a.at, a.chain_seq, a.prev_hash, a.hash, audit_log_canonical(a, a.prev_hash) AS canonical
        FROM audit_log a
        WHERE a.chain_seq > ${afterSeq}
        ORDER BY a.chain_seq
        LIMIT ${BATCH}`)
    ).rows;
    for (const row of rows) {
      if ((row.prev_hash ?? null) !== prev)
        return broken(row, 'its link to the previous entry does not match (an entry was removed, added or changed before it)');
      const hash = crypto.createHash('sha256').update(row.canonical, 'utf8').digest('hex');
      if (hash !== row.hash) return broken(row, 'its content no longer matches its seal (a field was changed)');
      prev = row.hash;
      checked += 1;
    }
    if (rows.length < BATCH) break;
    afterSeq = Number(rows[rows.length - 1].chain_seq);
  }
  if (unsealed) return broken(unsealed, 'it was never sealed into the chain');
  return { ok: true, checked, firstBroken: null };
}

/**
 * POST /api/audit/verify. The result is kept as the chain's last check (shown on the
 * administrator's home page; the watch's daily check counts its day from it).
 */
export async function verifyAuditChainFor(actor: Actor, now = new Date()): Promise<AuditVerifyResult> {
  requirePermission(actor, 'audit.verify');
  const result = await verifyAuditChain();
  await recordAuditCheck(db, result, now);
  return result;
}

/** A filter's `from`/`to`: a plant date (start of that day, or the end of it for `to`) or an instant. */
function bound(value: string, end: boolean): Date {
  if (/^\d{4}-\d{2}-\d{2}$/.test(value)) {
    const day = DateTime.fromISO(value, { zone: config.plantZone }).startOf('day');
    return (end ? day.plus({ days: 1 }) : day).toJSDate();
  }
  return new Date(value);
}

/** The audit list's filters (not the cursor), shared by GET /api/audit and its CSV. */
export function auditFilters(query: Pick<AuditQuery, 'entity' | 'entityId' | 'actor' | 'action' | 'from' | 'to'>): SQL[] {
  const where: SQL[] = [];
  if (query.entity) where.push(sql`a.entity_type = ${query.entity}`);
  if (query.entityId) where.push(sql`a.entity_id = ${query.entityId}`);
  if (query.actor) where.push(sql`a.actor_id = ${query.actor}`);
  if (query.action) where.push(sql`a.action = ${query.action}`);
  if (query.from) where.push(sql`a.at >= ${bound(query.from, false)}`);
  if (query.to) where.push(sql`a.at < ${bound(query.to, true)}`);
  return where;
}

const whereClause = (where: SQL[]) => (where.length ? sql`WHERE ${sql.join(where, sql` AND `)}` : sql``);

/** How many entries the filters match (the CSV checks its row cap with it). */
export async function countAudit(query: AuditQuery, tx: DbOrTx = db): Promise<number> {
  const rows = (await tx.execute<{ n: string }>(sql`SELECT count(*) AS n FROM audit_log a ${whereClause(auditFilters(query))}`)).rows;
  return Number(rows[0]?.n ?? 0);
}

/** GET /api/audit: newest first, filtered, paged by cursor (the last id seen). */
export async function listAudit(actor: Actor, query: AuditQuery, tx: DbOrTx = db): Promise<AuditPage> {
  requirePermission(actor, 'audit.read');
  const where = auditFilters(query);
  if (query.cursor) where.push(sql`a.id < ${query.cursor}`);
  const rows = (
    await tx.execute<{
      id: string;
      at: Date;
      actor_id: string | null;
      actor_name: string | null;
      actor_email: string | null;
      action: string;
      entity_type: string;
      entity_id: string;
      before: unknown;
      after: unknown;
      reason: string | null;
      prev_hash: string | null;
      hash: string | null;
    }>(sql`
      SELECT a.id, a.at, a.actor_id, u.name AS actor_name, u.email AS actor_email, a.action, a.entity_type, a.entity_id,
             a.before, a.after, a.reason, a.prev_hash, a.hash
      FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id
      ${whereClause(where)}
      ORDER BY a.id DESC
      LIMIT ${query.limit + 1}`)
  ).rows;
  const page = rows.slice(0, query.limit);
  const items: AuditItem[] = page.map((r) => ({
    id: Number(r.id),
    at: new Date(r.at).toISOString(),
    actor: r.actor_id ? { id: r.actor_id, name: r.actor_name ?? '', email: r.actor_email ?? '' } : null,
    action: r.action,
    entity: r.entity_type,
    entityId: r.entity_id,
    before: r.before ?? null,
    after: r.after ?? null,
    reason: r.reason,
    prevHash: r.prev_hash,
    hash: r.hash,
  }));
  return { items, nextCursor: rows.length > query.limit ? Number(page[page.length - 1].id) : null };
}

export { exportAuditCsv } from './export';
