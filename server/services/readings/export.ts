import { and, count, eq, sql } from 'drizzle-orm';
import type { ReadingQuery } from '../../../shared/schemas/readings';
import { readingSourceWords } from '../../../shared/words';
import { readings, stations, users } from '../../db/schema';
import type { CsvSink } from '../../csv';
import { exportList, exportTime, timeHeader } from '../exports';
import { READINGS_ORDER, readingsWhere } from './index';

interface ReadingRow {
  at: Date;
  /** Where the next page starts: the row's sort key as the database has it (microseconds kept). */
  key: { at: string; createdAt: string; id: string };
  area: string | null;
  stationCode: string | null;
  stationName: string | null;
  tempC: string | null;
  rhPct: string | null;
  irradiance: string | null;
  source: string;
  recordedByName: string | null;
}

const num = (v: string | null) => (v === null ? '' : Number(v));

/**
 * GET /api/readings?format=csv: every reading the same filters select (area or station, period),
 * newest first: not only the newest `limit` the JSON list answers with. Each page starts after
 * the last row of the one before (by the list's own order), so a year of readings is read once
 * instead of again up to every page's offset.
 */
export function exportReadingsCsv(query: ReadingQuery, sink: CsvSink, now = new Date()): Promise<void> {
  const where = readingsWhere(query);
  return exportList<ReadingRow>(
    sink,
    {
      list: 'readings',
      what: 'readings',
      header: [
        timeHeader('Taken'),
        'Area',
        'Station (own readings)',
        'Temperature (°C)',
        'Relative humidity (%)',
        'UV irradiance (mW/cm²)',
        'Source',
        'Recorded by',
      ],
      count: async (tx) => (await tx.select({ n: count() }).from(readings).where(where))[0].n,
      fetchPage: (tx, { last }, limit) => {
        const after = last?.key;
        return tx
          .select({
            at: readings.at,
            key: {
              at: sql<string>`${readings.at}::text`,
              createdAt: sql<string>`${readings.createdAt}::text`,
              id: readings.id,
            },
            area: readings.area,
            stationCode: stations.code,
            stationName: stations.name,
            tempC: readings.tempC,
            rhPct: readings.rhPct,
            irradiance: readings.irradianceMWcm2,
            source: readings.source,
            recordedByName: users.name,
          })
          .from(readings)
          .leftJoin(stations, eq(stations.id, readings.stationId))
          .leftJoin(users, eq(users.id, readings.recordedBy))
          .where(
            after
              ? and(
                  where,
                  // READINGS_ORDER is (at, created_at, id), all descending.
                  sql`(${readings.at}, ${readings.createdAt}, ${readings.id}) < (${after.at}::timestamptz, ${after.createdAt}::timestamptz, ${after.id}::uuid)`,
                )
              : where,
          )
          .orderBy(...READINGS_ORDER)
          .limit(limit);
      },
      toRow: (r) => [
        exportTime(r.at),
        r.area ?? '',
        r.stationCode ? `${r.stationCode} ${r.stationName ?? ''}`.trim() : '',
        num(r.tempC),
        num(r.rhPct),
        num(r.irradiance),
        readingSourceWords(r.source),
        r.recordedByName ?? '',
      ],
    },
    now,
  );
}
