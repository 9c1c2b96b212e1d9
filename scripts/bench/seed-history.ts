/**
 * Seeds a large invented production history for the trace benchmark, set-based (INSERT … SELECT
 * over generate_series), in a throwaway database. Ids are derived from the row's position
 * (md5 shaped as a version-4 UUID), so every table is filled by one statement with no lookups.
 *
 * Shape (defaults): 3 years × 2,000 drivers a day, batches of 200 (10 a day), two models with a
 * five-step recipe; each material's containers last a few batches and its lots a few containers
 * (the last batch on a container also draws on the next one, as when a cartridge runs dry
 * mid-batch), so one cyanoacrylate lot reaches 26 batches ≈ 5,200 drivers; about 1 driver in 100
 * fails final test (common practice) and is reworked at step 2 with the current containers.
 */
import type pg from 'pg';

export interface HistoryShape {
  days: number;
  driversPerDay: number;
  batchSize: number;
}

export interface BenchMaterial {
  key: string;
  name: string;
  kind: string;
  unit: string;
  step: number;
  /** Batches one container lasts. */
  batchesPerContainer: number;
  containersPerLot: number;
  viaMix?: 'resin' | 'hardener';
}

/** The invented catalogue; the cyanoacrylate (CA) lots are the ~5,000-driver lots the benchmark traces forward. */
export const BENCH_MATERIALS: BenchMaterial[] = [
  {
    key: 'RES',
    name: 'Bench epoxy resin',
    kind: 'adhesive',
    unit: 'g',
    step: 1,
    batchesPerContainer: 4,
    containersPerLot: 4,
    viaMix: 'resin',
  },
  {
    key: 'HRD',
    name: 'Bench epoxy hardener',
    kind: 'hardener',
    unit: 'g',
    step: 1,
    batchesPerContainer: 10,
    containersPerLot: 2,
    viaMix: 'hardener',
  },
  { key: 'CA', name: 'Bench cyanoacrylate', kind: 'adhesive', unit: 'g', step: 2, batchesPerContainer: 5, containersPerLot: 5 },
  { key: 'LW', name: 'Bench lead wire', kind: 'wire', unit: 'm', step: 2, batchesPerContainer: 12, containersPerLot: 3 },
  { key: 'TW', name: 'Bench tinsel wire', kind: 'wire', unit: 'm', step: 3, batchesPerContainer: 8, containersPerLot: 4 },
  { key: 'CAP', name: 'Bench dust-cap adhesive', kind: 'adhesive', unit: 'g', step: 4, batchesPerContainer: 6, containersPerLot: 5 },
  { key: 'DC', name: 'Bench dust caps', kind: 'dust_cap', unit: 'pcs', step: 4, batchesPerContainer: 3, containersPerLot: 10 },
];

export const BENCH_STEPS = ['Magnet bond', 'Moving parts', 'Lead termination', 'Dust cap', 'Magnetize and test'];
const STATION_KINDS = ['magnet_bond', 'moving_parts', 'lead_termination', 'dust_cap', 'magnetize_test'];

/** Serial of unit `u` (1-based) of batch `i` (0-based), as the seed writes it. */
export const benchSerial = (i: number, u: number) => `BW${String(i).padStart(6, '0')}-${String(u).padStart(4, '0')}`;
/** Supplier lot number of lot `n` of a material. */
export const benchSupplierLot = (key: string, n: number) => `${key}-${String(n).padStart(5, '0')}`;

/** A driver (x = i * batchSize + u) fails final test when x % 100 = 37, and is scrapped when x % 1000 = 137. */
const FAILS = '(x % 100 = 37)';
const mixPart = (part: 'resin' | 'hardener') => BENCH_MATERIALS.find((m) => m.viaMix === part)!;
const SCRAPPED = '(x % 1000 = 137)';

/**
 * Builds the big tables' secondary indexes after their bulk load rather than row by row (a sort
 * per index instead of millions of random B-tree inserts). Primary keys stay. Rows go in in the
 * order the plant makes them (a batch's drivers together), as the heap would hold them.
 */
async function withIndexesBuiltAfter(
  client: pg.Client,
  tables: string[],
  log: (m: string) => void,
  load: () => Promise<void>,
): Promise<void> {
  const { rows } = await client.query<{ name: string; def: string }>(
    `SELECT i.indexrelid::regclass::text AS name, pg_get_indexdef(i.indexrelid) AS def
     FROM pg_index i JOIN pg_class t ON t.oid = i.indrelid
     WHERE t.relname = ANY($1) AND NOT i.indisprimary AND NOT EXISTS (SELECT 1 FROM pg_constraint c WHERE c.conindid = i.indexrelid)`,
    [tables],
  );
  for (const r of rows) await client.query(`DROP INDEX ${r.name}`);
  await load();
  for (const r of rows) {
    const t = Date.now();
    await client.query(r.def);
    log(`  ${`index ${r.name}`.padEnd(34)} ${''.padStart(9)}       ${((Date.now() - t) / 1000).toFixed(1)} s`);
  }
}

export async function seedHistory(
  client: pg.Client,
  shape: HistoryShape,
  passwordHash: string,
  log: (m: string) => void,
): Promise<{ batches: number; drivers: number }> {
  const batchesPerDay = Math.max(1, Math.round(shape.driversPerDay / shape.batchSize));
  const nb = shape.days * batchesPerDay;
  const size = shape.batchSize;
  const minutesApart = Math.floor((24 * 60) / batchesPerDay);
  const q = async (label: string, text: string) => {
    const t = Date.now();
    const res = await client.query(text);
    log(`  ${label.padEnd(34)} ${String(res.rowCount ?? '').padStart(9)} rows  ${((Date.now() - t) / 1000).toFixed(1)} s`);
  };

  // A throwaway database: bulk-load without per-row foreign-key triggers (rows are consistent by construction).
  await client.query("SET session_replication_role = 'replica'");
  await client.query('SET synchronous_commit = off');
  await client.query("SET maintenance_work_mem = '256MB'");
  await client.query("SET work_mem = '64MB'");
  await client.query(`CREATE OR REPLACE FUNCTION pg_temp.id(t text) RETURNS uuid LANGUAGE sql IMMUTABLE AS
    $$ SELECT overlay(overlay(md5(t) placing '4' from 13) placing '8' from 17)::uuid $$`);
  // The two big tables get ids in the order rows are made (version-4 shaped, like a time-ordered
  // UUID): their primary keys grow at the right edge during the bulk load.
  await client.query(`CREATE OR REPLACE FUNCTION pg_temp.oid(p int, n bigint) RETURNS uuid LANGUAGE sql IMMUTABLE AS
    $$ SELECT (lpad(to_hex(p), 8, '0') || '-0000-4000-8' || lpad(to_hex(n), 15, '0'))::uuid $$`);
  await client.query(`CREATE TEMP TABLE bench_mat (key text, step int, k int, c int, via text, nc int, nl int)`);
  await client.query(
    `INSERT INTO bench_mat VALUES ${BENCH_MATERIALS.map((m) => {
      const nc = Math.floor((nb - 1) / m.batchesPerContainer) + 2; // one spare: the last batch draws on the next container
      return `('${m.key}', ${m.step}, ${m.batchesPerContainer}, ${m.containersPerLot}, ${m.viaMix ? `'${m.viaMix}'` : 'NULL'}, ${nc}, ${Math.ceil(nc / m.containersPerLot)})`;
    }).join(', ')}`,
  );
  // Batch i starts at t0 + day·1d + slot·minutesApart; the history (with its reworks) ends before today.
  const t0 = `(date_trunc('day', now()) - interval '${shape.days + 2} days' + interval '6 hours')`;
  const batchStart = (i: string) =>
    `(${t0} + (${i} / ${batchesPerDay}) * interval '1 day' + (${i} % ${batchesPerDay}) * interval '${minutesApart} minutes')`;

  await q(
    'users',
    `INSERT INTO users (id, email, name, password_hash, roles) VALUES
    (pg_temp.id('user'), 'bench-quality@tacklog.test', 'Bench quality engineer', '${passwordHash}', '{quality}')`,
  );
  await q(
    'suppliers',
    `INSERT INTO suppliers (id, code, name) VALUES
    (pg_temp.id('sup-1'), 'BSUP-1', 'Bench Bonding Chemicals'), (pg_temp.id('sup-2'), 'BSUP-2', 'Bench Coil and Wire'),
    (pg_temp.id('sup-3'), 'BSUP-3', 'Bench Paper Parts')`,
  );
  await q(
    'materials',
    `INSERT INTO materials (id, code, name, kind, unit, requires_inspection) VALUES ${BENCH_MATERIALS.map(
      (m) => `(pg_temp.id('mat-${m.key}'), 'B-${m.key}', '${m.name}', '${m.kind}', '${m.unit}', false)`,
    ).join(', ')}`,
  );
  await q(
    'stations',
    `INSERT INTO stations (id, code, name, kind, area)
    SELECT pg_temp.id('st-' || s), 'BST-' || s, 'Bench station ' || s, (ARRAY['${STATION_KINDS.join("','")}'])[s], 'bench hall'
    FROM generate_series(1, 5) s`,
  );
  await q(
    'models and recipes',
    `INSERT INTO driver_models (id, code, name) VALUES
    (pg_temp.id('model-0'), 'BW-12', 'Bench woofer 12'), (pg_temp.id('model-1'), 'BW-15', 'Bench woofer 15')`,
  );
  await q(
    'recipe steps',
    `INSERT INTO recipe_steps (id, model_id, seq, name, station_kind, wait_for_cure)
    SELECT pg_temp.id('step-' || m || '-' || s), pg_temp.id('model-' || m), s, (ARRAY['${BENCH_STEPS.join("','")}'])[s],
           (ARRAY['${STATION_KINDS.join("','")}'])[s], s = 4
    FROM generate_series(0, 1) m, generate_series(1, 5) s`,
  );
  await q(
    'recipe materials',
    `INSERT INTO recipe_step_materials (step_id, material_id, amount_per_unit)
    SELECT pg_temp.id('step-' || m || '-' || bm.step), pg_temp.id('mat-' || bm.key), 0.5 FROM generate_series(0, 1) m, bench_mat bm`,
  );
  await q(
    'lots',
    `INSERT INTO lots (id, material_id, supplier_id, supplier_lot, status, received_at)
    SELECT pg_temp.id('lot-' || bm.key || '-' || n), pg_temp.id('mat-' || bm.key),
           pg_temp.id('sup-' || CASE WHEN bm.key IN ('LW', 'TW') THEN 2 WHEN bm.key = 'DC' THEN 3 ELSE 1 END),
           bm.key || '-' || lpad(n::text, 5, '0'), CASE WHEN n < bm.nl - 1 THEN 'used_up' ELSE 'released' END::lot_status,
           ${batchStart(`(n * bm.c * bm.k)`)} - interval '7 days'
    FROM bench_mat bm, generate_series(0, bm.nl - 1) n`,
  );
  await q(
    'containers',
    `INSERT INTO containers (id, code, lot_id, seq, quantity, remaining, status)
    SELECT pg_temp.id('c-' || bm.key || '-' || n), 'BC-' || bm.key || '-' || n, pg_temp.id('lot-' || bm.key || '-' || (n / bm.c)),
           n % bm.c + 1, 1000, 0, 'empty'
    FROM bench_mat bm, generate_series(0, bm.nc - 1) n`,
  );
  await q(
    'build batches',
    `INSERT INTO build_batches (id, code, model_id, quantity, status, created_at, completed_at)
    SELECT pg_temp.id('b-' || i), 'BB' || lpad(i::text, 6, '0'), pg_temp.id('model-' || (i % 2)), ${size}, 'completed',
           ${batchStart('i')}, ${batchStart('i')} + interval '20 hours'
    FROM generate_series(0, ${nb - 1}) i`,
  );
  await q(
    'mixes',
    `INSERT INTO mixes (id, code, station_id, resin_container_id, hardener_container_id, resin_quantity, hardener_quantity, remaining, mixed_at, pot_life_ends_at, status)
    SELECT pg_temp.id('mix-' || i), 'BMX-' || i, pg_temp.id('st-1'), pg_temp.id('c-${mixPart('resin').key}-' || (i / ${mixPart('resin').batchesPerContainer})), pg_temp.id('c-${mixPart('hardener').key}-' || (i / ${mixPart('hardener').batchesPerContainer})),
           200, 100, 0, ${batchStart('i')} + interval '55 minutes', ${batchStart('i')} + interval '115 minutes', 'used_up'
    FROM generate_series(0, ${nb - 1}) i`,
  );
  await q(
    'step runs (whole batch)',
    `INSERT INTO step_runs (id, batch_id, step_id, station_id, kind, started_at, finished_at, cure_complete_at, units_done)
    SELECT pg_temp.id('run-' || i || '-' || s), pg_temp.id('b-' || i), pg_temp.id('step-' || (i % 2) || '-' || s), pg_temp.id('st-' || s), 'build',
           ${batchStart('i')} + s * interval '1 hour', ${batchStart('i')} + s * interval '1 hour' + interval '45 minutes',
           CASE WHEN s = 4 THEN ${batchStart('i')} + interval '18 hours' END, ${size}
    FROM generate_series(0, ${nb - 1}) i, generate_series(1, 5) s`,
  );
  await q(
    'step run materials (mixes)',
    `INSERT INTO step_run_materials (step_run_id, mix_id, quantity_used, loaded_at)
    SELECT pg_temp.id('run-' || i || '-1'), pg_temp.id('mix-' || i), 300, ${batchStart('i')} + interval '58 minutes'
    FROM generate_series(0, ${nb - 1}) i`,
  );
  await q(
    'step run materials (containers)',
    `INSERT INTO step_run_materials (step_run_id, container_id, quantity_used, loaded_at)
    SELECT pg_temp.id('run-' || i || '-' || bm.step), pg_temp.id('c-' || bm.key || '-' || (i / bm.k + o)), 100 - 60 * o,
           ${batchStart('i')} + bm.step * interval '1 hour' + o * interval '30 minutes'
    FROM bench_mat bm, generate_series(0, ${nb - 1}) i, generate_series(0, 1) o
    WHERE bm.via IS NULL AND (o = 0 OR i % bm.k = bm.k - 1)`,
  );
  // Per-batch values computed once; each batch's units generated inside it (x = i·size + u), so a
  // batch's drivers sit together in the heap as the plant's inserts would put them.
  const units = `WITH b AS MATERIALIZED (SELECT i, pg_temp.id('b-' || i) AS bid, ${batchStart('i')} AS at FROM generate_series(0, ${nb - 1}) i)`;
  const perUnit = `FROM b CROSS JOIN LATERAL generate_series(1, ${size}) u CROSS JOIN LATERAL (SELECT b.i * ${size} + u AS x) xx`;
  await withIndexesBuiltAfter(client, ['drivers', 'test_results'], log, async () => {
    await q(
      'drivers',
      `${units}
      INSERT INTO drivers (id, serial, batch_id, status, created_at)
      SELECT pg_temp.oid(1, x), 'BW' || lpad(b.i::text, 6, '0') || '-' || lpad(u::text, 4, '0'), b.bid,
             CASE WHEN ${SCRAPPED} THEN 'scrapped' ELSE 'passed' END::driver_status, b.at
      ${perUnit}`,
    );
    await q(
      'rework runs',
      `${units}
      INSERT INTO step_runs (id, batch_id, step_id, station_id, driver_id, kind, started_at, finished_at, units_done)
      SELECT pg_temp.id('rw-' || x), b.bid, pg_temp.id('step-' || (b.i % 2) || '-2'), pg_temp.id('st-2'), pg_temp.oid(1, x), 'rework',
             b.at + interval '26 hours', b.at + interval '26 hours 20 minutes', 1
      ${perUnit}
      WHERE ${FAILS} AND NOT ${SCRAPPED}`,
    );
    await q(
      'rework materials',
      `${units}
      INSERT INTO step_run_materials (step_run_id, container_id, quantity_used, loaded_at)
      SELECT pg_temp.id('rw-' || x), pg_temp.id('c-' || bm.key || '-' || (b.i / bm.k)), 0.5, b.at + interval '26 hours'
      ${perUnit} CROSS JOIN bench_mat bm
      WHERE bm.step = 2 AND ${FAILS} AND NOT ${SCRAPPED}`,
    );
    await q('defect codes', `INSERT INTO defect_codes (code, description) VALUES ('BRB', 'Bench rub and buzz') ON CONFLICT DO NOTHING`);
    await q(
      'final tests',
      `${units}
      INSERT INTO test_results (id, driver_id, result, defect_code, tested_at, tested_by)
      SELECT pg_temp.oid(2, x * 4 + r.n), pg_temp.oid(1, x), r.result::test_result, r.code, b.at + r.after, pg_temp.id('user')
      ${perUnit}
      CROSS JOIN LATERAL (VALUES (0, 'fail', 'BRB', interval '22 hours', ${FAILS}), (1, 'pass', NULL, interval '22 hours', NOT ${FAILS}),
                                 (2, 'pass', NULL, interval '28 hours', ${FAILS} AND NOT ${SCRAPPED})) r(n, result, code, after, wanted)
      WHERE r.wanted`,
    );
  });
  // The bulk load ran without triggers: count the batches' final-test outcomes as they would have.
  await q(
    'batch outcomes',
    `INSERT INTO batch_outcomes (batch_id, drivers, tested, failed)
    SELECT d.batch_id, count(*)::int, count(t.driver_id)::int, (count(*) FILTER (WHERE t.failed))::int
    FROM drivers d
    LEFT JOIN (SELECT driver_id, bool_or(result = 'fail') AS failed FROM test_results GROUP BY driver_id) t ON t.driver_id = d.id
    GROUP BY d.batch_id`,
  );
  await client.query("SET session_replication_role = 'origin'");
  const t = Date.now();
  // VACUUM as well as ANALYZE: a freshly loaded table of millions of rows is otherwise vacuumed by
  // autovacuum a minute or two later (its insert threshold), on one of the two cores, while the
  // benchmark measures — a plant's database is not in that state, and pgbench vacuums its own.
  await client.query('VACUUM (ANALYZE)');
  log(`  ${'VACUUM (ANALYZE)'.padEnd(34)} ${''.padStart(9)}       ${((Date.now() - t) / 1000).toFixed(1)} s`);
  return { batches: nb, drivers: nb * size };
}
