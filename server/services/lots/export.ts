import type { LotListItem, LotListQuery } from '../../../shared/schemas/lots';
import { expiryCauseText, lotStatusWords } from '../../../shared/words';
import type { CsvSink } from '../../csv';
import { exportList, exportTime, timeHeader } from '../exports';
import { listLots } from './list';

const qty = (n: number) => Number(n.toFixed(3));

/**
 * GET /api/lots?format=csv: every lot the same filters list, in the screen's sort order, with
 * the columns the page shows and a few it keeps behind a click (supplier's dates, reason, notes).
 */
export function exportLotsCsv(query: LotListQuery, sink: CsvSink, now = new Date()): Promise<void> {
  const filters = { ...query, offset: 0 };
  return exportList<LotListItem>(
    sink,
    {
      list: 'lots',
      what: 'lots',
      header: [
        'Supplier lot',
        'Supplier',
        'Material code',
        'Material',
        'Status',
        timeHeader('Received'),
        'Manufactured (date)',
        "Supplier's expiry (date)",
        timeHeader('Expires'),
        'Expiry set by',
        'On hand',
        'Unit',
        'Containers in use or sealed',
        'Containers received',
        'Status reason',
        'Certificate valid until (date)',
        'GTIN',
        'Notes',
      ],
      count: async (tx) => (await listLots({ ...filters, limit: 1 }, now, tx)).total,
      fetchPage: async (tx, { offset }, limit) => (await listLots({ ...filters, offset, limit }, now, tx)).items,
      toRow: (l) => [
        l.supplierLot,
        l.supplierName,
        l.materialCode,
        l.materialName,
        lotStatusWords(l.status),
        exportTime(l.receivedAt),
        l.manufacturedOn ?? '',
        l.expiresOn ?? '',
        exportTime(l.effectiveExpiry),
        expiryCauseText(l.expiryCause),
        qty(l.remaining),
        l.materialUnit,
        l.activeContainerCount,
        l.containerCount,
        l.statusReason ?? '',
        l.certificateExpiresOn ?? '',
        l.gtin ?? '',
        l.notes ?? '',
      ],
    },
    now,
  );
}
