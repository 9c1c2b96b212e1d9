/**
 * The one CSV writer of the server: every export (stock, expiry outlook, containment list, the
 * lists of lots, alerts, batches, readings and the audit trail) goes through `csvField` /
 * `csvRecord`, so quoting and the formula guard are decided here once.
 *
 * Hand-written on purpose rather than csv-stringify: RFC 4180 quoting is two rules, and
 * csv-stringify needs two non-default options to be right for us (with `record_delimiter:
 * 'windows'` a field holding a lone LF or CR is left unquoted unless `quote_record_delimiter` /
 * `quoted_match` is set), while its `escape_formulas` prefixes every value starting with "-",
 * negative temperatures included. The output is checked against csv-parse (a reference parser)
 * in tests/unit/csv.test.ts.
 */
import type { Response } from 'express';
import { logger } from './logger';

export type CsvCell = string | number | null | undefined;

/** A plain decimal number ("-3.5", "+2"): a spreadsheet reads it as that number, not as a formula. */
const PLAIN_NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

/**
 * One CSV field per RFC 4180 §2: a field holding a comma, a double quote, CR or LF is enclosed
 * in double quotes, and a double quote inside it is doubled (rules 6–7). A text a spreadsheet
 * would run as a formula (starting with =, +, -, @, tab or CR) gets a leading apostrophe
 * (OWASP "CSV Injection"); numbers, and text that is only a plain number, are left as they are.
 */
export function csvField(value: CsvCell): string {
  let s = value === null || value === undefined ? '' : String(value);
  if (typeof value === 'string' && /^[=+\-@\t\r]/.test(s) && !PLAIN_NUMBER.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** One record ended by CRLF (RFC 4180 §2 rules 1–2). */
export function csvRecord(row: readonly CsvCell[]): string {
  return row.map(csvField).join(',') + '\r\n';
}

/** Records joined with CRLF, the last one ended too (RFC 4180 §2, rules 1–2). */
export function toCsv(rows: readonly (readonly CsvCell[])[]): string {
  return rows.map(csvRecord).join('');
}

/** A file name safe in a Content-Disposition header: letters, digits, dot, dash, underscore. */
export function safeFileName(s: string): string {
  return (
    s
      .replace(/[^A-Za-z0-9._-]+/g, '_')
      .replace(/^[._]+/, '')
      .slice(0, 80) || 'export'
  );
}

const CSV_TYPE = 'text/csv; charset=utf-8; header=present';

/** `attachment; filename="tacklog-lots-2026-12-02.csv"`: the name quoted, and kept to safe characters. */
function attachment(res: Response, filename: string): Response {
  return res.set('Content-Disposition', `attachment; filename="${safeFileName(filename)}"`);
}

/** Sends a CSV built in memory (small exports: stock, outlook, containment). */
export function sendCsv(res: Response, csv: { filename: string; body: string }): undefined {
  attachment(res.status(200).type(CSV_TYPE), csv.filename).set('Cache-Control', 'no-store').send(csv.body);
  return undefined;
}

/**
 * Where a list export writes: `start` once (file name and header row), then `write` each page of
 * rows as it is read. `write` waits while the client is slower than the database (backpressure).
 */
export interface CsvSink {
  start(filename: string, header: readonly string[]): void;
  write(rows: readonly (readonly CsvCell[])[]): Promise<void>;
}

class ClientGone extends Error {
  constructor() {
    super('the client closed the connection during a CSV export');
  }
}

/**
 * Streams a list export: `produce` checks and counts first (a refusal before `start` is an
 * ordinary error answer), then writes pages. A failure after the first byte cannot change the
 * status any more: it is logged and the connection is cut, so the download is visibly broken
 * rather than silently short.
 */
export async function streamCsv(res: Response, produce: (sink: CsvSink) => Promise<void>): Promise<undefined> {
  let started = false;
  const sink: CsvSink = {
    start(filename, header) {
      started = true;
      attachment(res.status(200).type(CSV_TYPE), filename).set('Cache-Control', 'no-store');
      res.write(csvRecord(header));
    },
    async write(rows) {
      // The person cancelled the download: stop reading pages for nobody.
      if (res.destroyed) throw new ClientGone();
      if (!rows.length) return;
      if (!res.write(rows.map(csvRecord).join(''))) {
        await new Promise<void>((resolve) => {
          const done = () => {
            res.off('drain', done);
            res.off('close', done);
            resolve();
          };
          res.on('drain', done);
          res.on('close', done);
        });
      }
    },
  };
  try {
    await produce(sink);
  } catch (err) {
    if (!started) throw err;
    const log = res.req?.log ?? logger;
    if (err instanceof ClientGone) log.info('CSV export cancelled by the client');
    else log.error({ err }, 'CSV export failed after it started; connection cut');
    res.destroy();
    return undefined;
  }
  if (!started) throw new Error('CSV export produced no header');
  res.end();
  return undefined;
}
