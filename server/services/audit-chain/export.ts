import type { AuditItem, AuditQuery } from '../../../shared/schemas/audit';
import { auditActionText, auditChangesLine, auditRecordName, entityText } from '../../../shared/audit-words';
import { config } from '../../config';
import type { CsvSink } from '../../csv';
import { requirePermission, type Actor } from '../auth/actor';
import { exportList, exportTime, timeHeader } from '../exports';
import { countAudit, listAudit } from './index';

/**
 * GET /api/audit?format=csv: every entry the same filters select, newest first, as the page
 * reads them (actions, record types and old → new values in words), with each entry's seal so
 * an auditor can see the chain in the spreadsheet too.
 */
export function exportAuditCsv(actor: Actor, query: AuditQuery, sink: CsvSink, now = new Date()): Promise<void> {
  requirePermission(actor, 'audit.read');
  const filters: AuditQuery = { ...query, cursor: undefined };
  return exportList<AuditItem>(
    sink,
    {
      list: 'audit',
      what: 'audit entries',
      header: [
        'Entry',
        timeHeader('Recorded'),
        'Person',
        'E-mail',
        'Action',
        'Record type',
        'Record',
        'Record id',
        'Changes',
        'Reason',
        'Seal (SHA-256)',
        'Seal of the entry before',
      ],
      count: (tx) => countAudit(filters, tx),
      // Pages follow the id downwards (the list's own cursor): no offset to skip over.
      fetchPage: async (tx, { last }, limit) => (await listAudit(actor, { ...filters, cursor: last?.id, limit }, tx)).items,
      toRow: (e) => [
        e.id,
        exportTime(e.at),
        e.actor?.name ?? 'Tacklog (automatic)',
        e.actor?.email ?? '',
        auditActionText(e.action),
        entityText(e.entity),
        auditRecordName(e),
        e.entityId,
        auditChangesLine(e, config.plantZone),
        e.reason ?? '',
        e.hash ?? '',
        e.prevHash ?? '',
      ],
    },
    now,
  );
}
