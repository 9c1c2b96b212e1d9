import { CONTAINMENT_CSV_COLUMNS } from '../../../shared/schemas/trace';
import { loadLotTrace } from './lot-trace';
import { plantDate, plantDateTime } from '../../plant-time';

/**
 * One CSV field per RFC 4180 §2: a field holding a comma, a double quote, CR or LF is
 * enclosed in double quotes, and a double quote inside it is doubled. A field a spreadsheet
 * would run as a formula (starting with =, +, -, @, tab or CR) gets a leading apostrophe
 * (OWASP "CSV Injection" advice).
 */
export function csvField(value: string | number | null | undefined): string {
  let s = value === null || value === undefined ? '' : String(value);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Records joined with CRLF, the last one ended too (RFC 4180 §2, rules 1–2). */
export function toCsv(rows: (string | number | null | undefined)[][]): string {
  return rows.map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}

/** A file name safe in a Content-Disposition header: letters, digits, dot, dash, underscore. */
export function safeFileName(s: string): string {
  return (
    s
      .replace(/[^A-Za-z0-9._-]+/g, '_')
      .replace(/^[._]+/, '')
      .slice(0, 80) || 'lot'
  );
}

export interface ContainmentCsv {
  filename: string;
  body: string;
}

/**
 * GET /api/lots/:id/trace.csv — the containment list: one row per driver and use of the lot
 * (a driver built in a run that used two containers of the lot gets two rows). Times are plant
 * time (TACKLOG_PLANT_ZONE) as people read them elsewhere: 2026-12-02 07:25.
 */
export async function lotContainmentCsv(lotId: string, now = new Date()): Promise<ContainmentCsv> {
  const { trace, usesRaw, driverIdsByRun, driverById } = await loadLotTrace(lotId);
  const records: { serial: string; finishedMs: number; row: (string | null)[] }[] = [];
  for (const u of usesRaw) {
    for (const id of driverIdsByRun.get(u.step_run_id) ?? []) {
      const d = driverById.get(id);
      if (!d) continue;
      const finishedAt = u.finished_at ? new Date(u.finished_at) : null;
      const finished = finishedAt ? plantDateTime(finishedAt) : '';
      records.push({
        serial: d.serial,
        finishedMs: finishedAt ? finishedAt.getTime() : Number.POSITIVE_INFINITY,
        row: [
          d.serial,
          d.status,
          u.batch_code,
          u.model_code,
          `${u.seq} ${u.step_name}`,
          u.station_code,
          finished,
          u.container_code,
          u.mix_code,
        ],
      });
    }
  }
  records.sort((a, b) => (a.serial < b.serial ? -1 : a.serial > b.serial ? 1 : a.finishedMs - b.finishedMs));
  const day = plantDate(now);
  return {
    filename: `containment-${safeFileName(`${trace.lot.materialCode}-${trace.lot.supplierLot}`)}-${day}.csv`,
    body: toCsv([[...CONTAINMENT_CSV_COLUMNS], ...records.map((r) => r.row)]),
  };
}
