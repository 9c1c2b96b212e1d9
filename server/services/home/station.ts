import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import type { HomeAssembler } from '../../../shared/schemas/home';
import type { CureItem } from '../../../shared/schemas/cure';
import type { Actor } from '../auth/actor';

type StationRow = { id: string; code: string; name: string; kind: string; area: string };
type Station = NonNullable<HomeAssembler['station']>;
type Batch = NonNullable<HomeAssembler['batch']>;

const iso = (v: Date | string) => new Date(v).toISOString();

/**
 * The station an assembler works at: the one this device is set to (the station screen
 * remembers it on the device and the home page sends it), else the station where this person
 * last started or finished a step, loaded a container or mixed.
 */
export async function stationOf(tx: DbOrTx, actor: Actor, deviceStationId?: string): Promise<Station | null> {
  if (deviceStationId) {
    const [row] = (await tx.execute<StationRow>(sql`SELECT id, code, name, kind, area FROM stations WHERE id = ${deviceStationId}`)).rows;
    if (row) return { ...row, source: 'device' };
  }
  const [row] = (
    await tx.execute<StationRow>(sql`
      SELECT s.id, s.code, s.name, s.kind, s.area
      FROM (
        (SELECT station_id, started_at AS at FROM step_runs WHERE started_by = ${actor.id} ORDER BY started_at DESC LIMIT 1)
        UNION ALL
        (SELECT station_id, finished_at FROM step_runs WHERE finished_by = ${actor.id} AND finished_at IS NOT NULL
         ORDER BY finished_at DESC LIMIT 1)
        UNION ALL
        (SELECT station_id, loaded_at FROM station_loads WHERE loaded_by = ${actor.id} ORDER BY loaded_at DESC LIMIT 1)
        UNION ALL
        (SELECT station_id, mixed_at FROM mixes WHERE mixed_by = ${actor.id} ORDER BY mixed_at DESC LIMIT 1)
      ) last
      JOIN stations s ON s.id = last.station_id
      ORDER BY last.at DESC
      LIMIT 1`)
  ).rows;
  return row ? { ...row, source: 'last-activity' } : null;
}

type BatchRow = {
  batch_id: string;
  batch_code: string;
  model_code: string;
  quantity: number;
  state: Batch['state'];
  step_id: string | null;
  step_seq: number | null;
  step_name: string | null;
  since: Date | string;
  loaded: number;
  step_run_id: string | null;
  cure_complete_at: Date | string | null;
};

/**
 * The batch at a station now, in this order: a step running there; else the batch its loaded
 * containers and mixes are for (with the first step of its recipe for this kind of station not
 * yet finished); else the step that last finished there. One statement.
 */
export async function batchAtStation(tx: DbOrTx, station: Station): Promise<(Batch & { stepRunId: string | null }) | null> {
  const [row] = (
    await tx.execute<BatchRow>(sql`
      WITH loaded AS (
        SELECT batch_id, min(loaded_at) AS since, count(*)::int AS n
        FROM station_loads
        WHERE station_id = ${station.id} AND unloaded_at IS NULL
        GROUP BY batch_id
      ),
      running AS (
        SELECT 'running' AS state, 1 AS rank, r.batch_id, r.step_id, r.started_at AS since, r.id AS step_run_id, NULL::timestamptz AS cure_complete_at
        FROM step_runs r
        WHERE r.station_id = ${station.id} AND r.finished_at IS NULL
        ORDER BY r.started_at DESC
        LIMIT 1
      ),
      waiting AS (
        SELECT 'loaded' AS state, 2 AS rank, l.batch_id,
               (SELECT rs.id FROM recipe_steps rs
                WHERE rs.model_id = b.model_id AND rs.station_kind = ${station.kind}
                  AND NOT EXISTS (SELECT 1 FROM step_runs d WHERE d.batch_id = b.id AND d.step_id = rs.id
                                  AND d.driver_id IS NULL AND d.finished_at IS NOT NULL)
                ORDER BY rs.seq LIMIT 1) AS step_id,
               l.since, NULL::uuid AS step_run_id, NULL::timestamptz AS cure_complete_at
        FROM loaded l JOIN build_batches b ON b.id = l.batch_id
        ORDER BY l.since DESC
        LIMIT 1
      ),
      finished AS (
        SELECT 'finished' AS state, 3 AS rank, r.batch_id, r.step_id, r.finished_at AS since, r.id AS step_run_id, r.cure_complete_at
        FROM step_runs r
        WHERE r.station_id = ${station.id} AND r.finished_at IS NOT NULL
        ORDER BY r.finished_at DESC
        LIMIT 1
      ),
      pick AS (
        SELECT * FROM (SELECT * FROM running UNION ALL SELECT * FROM waiting UNION ALL SELECT * FROM finished) x
        ORDER BY rank LIMIT 1
      )
      SELECT p.state, p.batch_id, b.code AS batch_code, m.code AS model_code, b.quantity,
             p.step_id, s.seq AS step_seq, s.name AS step_name, p.since, p.step_run_id, p.cure_complete_at,
             coalesce((SELECT n FROM loaded WHERE loaded.batch_id = p.batch_id), 0)::int AS loaded
      FROM pick p
      JOIN build_batches b ON b.id = p.batch_id
      JOIN driver_models m ON m.id = b.model_id
      LEFT JOIN recipe_steps s ON s.id = p.step_id`)
  ).rows;
  if (!row) return null;
  return {
    id: row.batch_id,
    code: row.batch_code,
    modelCode: row.model_code,
    quantity: row.quantity,
    state: row.state,
    step:
      row.step_id && row.step_seq !== null && row.step_name !== null ? { id: row.step_id, seq: row.step_seq, name: row.step_name } : null,
    since: iso(row.since),
    loadedCount: row.loaded,
    cureCompleteAt: row.cure_complete_at ? iso(row.cure_complete_at) : null,
    stepRunId: row.step_run_id,
  };
}

/**
 * Cures still running that end within `withinHours`, soonest first, from the cure board's
 * items (recomputed from the readings, so the home page says what the cure board says).
 */
export function curesEndingSoon(board: CureItem[], now: Date, withinHours: number, shown: number): HomeAssembler['curesEndingSoon'] {
  const until = now.getTime() + withinHours * 3_600_000;
  const soon = board
    .filter(
      (i) => !i.ready && i.cureCompleteAt !== null && Date.parse(i.cureCompleteAt) > now.getTime() && Date.parse(i.cureCompleteAt) <= until,
    )
    .sort((a, b) => Date.parse(a.cureCompleteAt!) - Date.parse(b.cureCompleteAt!));
  return {
    withinHours,
    count: soon.length,
    items: soon.slice(0, shown).map((i) => ({
      stepRunId: i.stepRunId,
      batchId: i.batchId,
      batchCode: i.batchCode,
      stepName: i.stepName,
      stationCode: i.stationCode,
      cureCompleteAt: i.cureCompleteAt!,
    })),
  };
}
