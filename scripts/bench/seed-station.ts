/**
 * What the station-path benchmark needs beside the history: a floor of `lanes` assemblers at as
 * many "moving_parts" stations (the history's own and more like it), open batches of model BW-12
 * (nothing run yet, so their next step at such a station is "Moving parts"), and a released lot
 * of the step's cyanoacrylate with many sealed containers under real container codes (TLC-…,
 * with their check symbol), each loaded once during the run.
 */
import type pg from 'pg';
import { CROCKFORD_ALPHABET, containerCodeFromBody } from '../../shared/schemas/containers';

export const BENCH_ASSEMBLER = 'bench-assembler@tacklog.test';
/** The assembler of lane n (1-based); lane 1 is BENCH_ASSEMBLER. */
export const benchAssembler = (n: number) => (n === 1 ? BENCH_ASSEMBLER : `bench-assembler-${String(n).padStart(2, '0')}@tacklog.test`);

/** Container code number n (distinct for n < 32^8). */
export function benchContainerCode(n: number): string {
  let body = '';
  let v = n + 32 ** 7; // a leading non-zero symbol
  for (let i = 0; i < 8; i++) {
    body = CROCKFORD_ALPHABET[v % 32] + body;
    v = Math.floor(v / 32);
  }
  return containerCodeFromBody(body);
}

export interface StationFixture {
  /** Per lane: the assembler's e-mail, the station, the batch. */
  assemblers: string[];
  stationIds: string[];
  batchIds: string[];
  codes: string[];
}

export async function seedStationFixture(
  client: pg.Client,
  passwordHash: string,
  containers: number,
  lanes: number,
): Promise<StationFixture> {
  const md5id = (t: string) => `overlay(overlay(md5('${t}') placing '4' from 13) placing '8' from 17)::uuid`;
  const assemblers = Array.from({ length: lanes }, (_, i) => benchAssembler(i + 1));
  await client.query(
    `INSERT INTO users (email, name, password_hash, roles)
     SELECT e, 'Bench assembler ' || n, $2, '{assembler}' FROM unnest($1::text[]) WITH ORDINALITY AS t(e, n)
     ON CONFLICT DO NOTHING`,
    [assemblers, passwordHash],
  );
  await client.query(`UPDATE users SET password_hash = $1 WHERE email = ANY($2)`, [passwordHash, assemblers]);
  // The history's moving-parts station, and more like it in the same hall (made once per database).
  const first = (await client.query<{ id: string }>(`SELECT ${md5id('st-2')} AS id`)).rows[0].id;
  const more = Array.from({ length: lanes - 1 }, (_, i) => `BST-SCAN-${String(i + 2).padStart(2, '0')}`);
  await client.query(
    `INSERT INTO stations (code, name, kind, area)
     SELECT c, 'Bench scan station ' || substr(c, 10), s.kind, s.area FROM unnest($1::text[]) AS c, stations s WHERE s.id = $2
     ON CONFLICT DO NOTHING`,
    [more, first],
  );
  const byCode = new Map(
    (await client.query<{ id: string; code: string }>('SELECT id, code FROM stations WHERE code = ANY($1)', [more])).rows.map((r) => [
      r.code,
      r.id,
    ]),
  );
  const stationIds = [first, ...more.map((c) => byCode.get(c)!)];
  const lot = await client.query<{ id: string }>(`
    INSERT INTO lots (material_id, supplier_id, supplier_lot, status, received_at)
    VALUES (${md5id('mat-CA')}, ${md5id('sup-1')}, 'CA-SCAN-' || to_char(now(), 'YYYYMMDDHH24MISS'), 'released', now() - interval '2 days')
    RETURNING id`);
  const codes = Array.from({ length: containers }, (_, i) => benchContainerCode((Date.now() % 1_000_000) * 1000 + i));
  await client.query(
    `INSERT INTO containers (code, lot_id, seq, quantity, remaining, status)
     SELECT c, $1, n, 1000, 1000, 'sealed' FROM unnest($2::text[]) WITH ORDINALITY AS t(c, n)`,
    [lot.rows[0].id, codes],
  );
  const batches = await client.query<{ id: string }>(
    `INSERT INTO build_batches (code, model_id, quantity, status)
     SELECT 'BSCAN-' || to_char(now(), 'HH24MISS') || '-' || lpad(i::text, 3, '0'), ${md5id('model-0')}, 200, 'open'
     FROM generate_series(1, $1::int) i RETURNING id`,
    [lanes],
  );
  // Vacuumed now rather than by autovacuum in the middle of a measurement.
  await client.query('VACUUM (ANALYZE) containers, build_batches, lots');
  return { assemblers, stationIds, batchIds: batches.rows.map((r) => r.id), codes };
}
