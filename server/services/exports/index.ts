/**
 * What every list export shares: one consistent snapshot of the database for the whole file
 * (a read-only REPEATABLE READ transaction, so paging through it neither skips nor repeats a
 * row that changes meanwhile), the row cap (setting `csvExportMaxRows`, refused before the first
 * byte when more rows match), the file name (`tacklog-<list>-<plant date>.csv`) and the way
 * time columns name the plant's zone.
 */
import { db, type Tx } from '../../db/client';
import { conflict } from '../../errors';
import { config } from '../../config';
import { plantDate, plantDateTime } from '../../plant-time';
import { readSetting } from '../settings';
import type { CsvCell, CsvSink } from '../../csv';

/** Rows read from the database per page while an export streams. */
export const EXPORT_PAGE_ROWS = 1000;

export function inExportSnapshot(work: (tx: Tx) => Promise<void>): Promise<void> {
  return db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });
}

/** Refuses (409 EXPORT_TOO_LARGE) when more rows match than one export may hold. */
export async function checkExportSize(tx: Tx, total: number, what: string): Promise<void> {
  const max = await readSetting('csvExportMaxRows', tx);
  if (total > max) {
    throw conflict(
      'EXPORT_TOO_LARGE',
      `${total} ${what} match these filters; one export holds at most ${max}. Narrow the filters (a shorter period, one status) and export again.`,
      { total, max },
    );
  }
}

/** tacklog-lots-2026-12-02.csv: the list and the plant's date today. */
export function exportFileName(list: string, now: Date = new Date()): string {
  return `tacklog-${list}-${plantDate(now)}.csv`;
}

/** A time column's header: "Received (plant time, Europe/Berlin)". */
export function timeHeader(label: string): string {
  return `${label} (plant time, ${config.plantZone})`;
}

/** An instant as the one plant format (2026-12-02 07:25), empty when there is none. */
export function exportTime(value: string | Date | null | undefined): string {
  return value ? plantDateTime(value) : '';
}

/**
 * Where the next page starts: after `offset` rows, or — for a list read by its own order — after
 * `last`, the last row of the page before (undefined for the first page).
 */
export interface PageStart<T> {
  offset: number;
  last: T | undefined;
}

/**
 * Pages through a list with `fetchPage(start)` inside the snapshot and writes each page; stops
 * at a short page. Returns the rows written.
 */
export async function writePages<T>(
  sink: CsvSink,
  fetchPage: (start: PageStart<T>) => Promise<readonly T[]>,
  toRow: (item: T) => CsvCell[],
  pageRows = EXPORT_PAGE_ROWS,
): Promise<number> {
  let written = 0;
  let last: T | undefined;
  for (;;) {
    const items = await fetchPage({ offset: written, last });
    await sink.write(items.map(toRow));
    written += items.length;
    last = items.at(-1) ?? last;
    if (items.length < pageRows) return written;
  }
}

export interface ListExport<T> {
  /** "lots": the file is tacklog-lots-<plant date>.csv. */
  list: string;
  /** What the rows are, for the refusal: "lots". */
  what: string;
  header: readonly string[];
  count: (tx: Tx) => Promise<number>;
  /** One page of `limit` rows from `start`: by offset, or after the last row of the page before. */
  fetchPage: (tx: Tx, start: PageStart<T>, limit: number) => Promise<readonly T[]>;
  toRow: (item: T) => CsvCell[];
}

/** Counts, refuses above the cap, then streams every matching row, all in one snapshot. */
export function exportList<T>(sink: CsvSink, spec: ListExport<T>, now: Date = new Date()): Promise<void> {
  return inExportSnapshot(async (tx) => {
    await checkExportSize(tx, await spec.count(tx), spec.what);
    sink.start(exportFileName(spec.list, now), spec.header);
    await writePages(sink, (start) => spec.fetchPage(tx, start, EXPORT_PAGE_ROWS), spec.toRow);
  });
}
