import { and, count, getTableColumns, sql } from 'drizzle-orm';
import type { Alert, AlertListQuery } from '../../../shared/schemas/alerts';
import { alerts } from '../../db/schema';
import { alertKindWords, alertSeverityWords, alertStateWords } from '../../../shared/words';
import { entityText } from '../../../shared/audit-words';
import type { CsvSink } from '../../csv';
import type { Actor } from '../auth/actor';
import { exportList, exportTime, timeHeader } from '../exports';
import { ALERTS_ORDER, alertsWhere, namesOf, toAlert } from './index';

/** An alert with where the next page starts: its raised time as the database has it (microseconds kept) and its id. */
type AlertWithKey = Alert & { key: { raisedAt: string; id: string } };

/**
 * GET /api/alerts?format=csv: every alert the same filters list for this person (their roles'
 * alerts; all for an administrator), newest first, in words. Each page starts after the last
 * row of the one before, by the list's own order (raised, newest first; then id), so years of
 * alerts are read once rather than again up to every page's offset.
 */
export function exportAlertsCsv(actor: Actor, query: AlertListQuery, sink: CsvSink, now = new Date()): Promise<void> {
  const where = alertsWhere(actor, { state: query.state, kind: query.kind });
  return exportList<AlertWithKey>(
    sink,
    {
      list: 'alerts',
      what: 'alerts',
      header: [
        timeHeader('Raised'),
        'Severity',
        'State',
        'Kind',
        'About',
        'Message',
        'Detail',
        timeHeader('Acknowledged'),
        'Acknowledged by',
        timeHeader('Resolved'),
        'Resolved by',
        'Resolution',
      ],
      count: async (tx) => (await tx.select({ n: count() }).from(alerts).where(where))[0].n,
      fetchPage: async (tx, { last }, limit) => {
        const after = last?.key;
        const rows = await tx
          .select({ ...getTableColumns(alerts), keyRaisedAt: sql<string>`${alerts.raisedAt}::text` })
          .from(alerts)
          .where(
            after
              ? and(
                  where,
                  // ALERTS_ORDER is raised_at descending, then id ascending.
                  sql`(${alerts.raisedAt} < ${after.raisedAt}::timestamptz OR (${alerts.raisedAt} = ${after.raisedAt}::timestamptz AND ${alerts.id} > ${after.id}::uuid))`,
                )
              : where,
          )
          .orderBy(...ALERTS_ORDER)
          .limit(limit);
        const names = await namesOf(tx, rows);
        return rows.map(({ keyRaisedAt, ...row }) => ({ ...toAlert(row, names), key: { raisedAt: keyRaisedAt, id: row.id } }));
      },
      toRow: (a) => [
        exportTime(a.raisedAt),
        alertSeverityWords(a.severity),
        alertStateWords(a.state),
        alertKindWords(a.kind),
        entityText(a.subjectType),
        a.message,
        a.detail ?? '',
        exportTime(a.acknowledgedAt),
        a.acknowledgedAt ? (a.acknowledgedByName ?? '') : '',
        exportTime(a.resolvedAt),
        a.resolvedAt ? (a.resolvedByName ?? (a.resolvedBy ? '' : 'Tacklog (condition cleared)')) : '',
        a.resolution ?? '',
      ],
    },
    now,
  );
}
