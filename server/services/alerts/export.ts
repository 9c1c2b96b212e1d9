import type { Alert, AlertListQuery } from '../../../shared/schemas/alerts';
import { alertKindWords, alertSeverityWords, alertStateWords } from '../../../shared/words';
import { entityText } from '../../../shared/audit-words';
import type { CsvSink } from '../../csv';
import type { Actor } from '../auth/actor';
import { exportList, exportTime, timeHeader } from '../exports';
import { listAlerts } from './index';

/**
 * GET /api/alerts?format=csv: every alert the same filters list for this person (their roles'
 * alerts; all for an administrator), newest first, in words.
 */
export function exportAlertsCsv(actor: Actor, query: AlertListQuery, sink: CsvSink, now = new Date()): Promise<void> {
  const filters = { state: query.state, kind: query.kind };
  return exportList<Alert>(
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
      count: async (tx) => (await listAlerts(actor, { ...filters, limit: 1, offset: 0 }, tx)).total,
      fetchPage: async (tx, offset, limit) => (await listAlerts(actor, { ...filters, limit, offset }, tx)).items,
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
