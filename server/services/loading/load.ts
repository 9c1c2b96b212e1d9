import crypto from 'node:crypto';
import { eq, inArray, sql } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { namedStatement } from '../../db/named';
import { containers, drivers, lots, materials, type stationLoads } from '../../db/schema';
import { rowFromJson, rowJson } from '../../db/row-json';
import { AppError, conflict, notFound } from '../../errors';
import type { Actor } from '../auth/actor';
import { KEY_TAKEN, type HandlerClaimedKey } from '../../middleware/idempotency';
import { requirePermission } from '../auth/actor';
import { checkBatchOpen } from '../batches/progress';
import type { LoadInput, LoadResult } from '../../../shared/schemas/station-loads';
import type { RecipeStep } from '../../../shared/schemas/models';
import { mixByCode, scannedContainerCode, unknownCode, type ContainerContext } from './context';
import { checkContainerUsable, checkMixUsable, type MaterialRow } from './usability';
import { containerPart, describeLoads } from './describe';
import { stationKindWords } from '../../../shared/words';

const kindWords = (kind: string) => stationKindWords(kind).toLowerCase();

/** What a load needs of the station. */
interface StationRow {
  id: string;
  code: string;
  kind: string;
  active: boolean;
}
type LoadRow = typeof stationLoads.$inferSelect;

interface LoadContextRow {
  /** Rows the idempotency claim inserted: 1 claimed, 0 the key was taken (null: no claim asked). */
  claimed: number | null;
  container: Record<string, unknown> | null;
  /** The container row's version (its xmin) as read: the write goes ahead only on this version. */
  container_version: string | null;
  lot: Record<string, unknown> | null;
  material: Record<string, unknown> | null;
  station_id: string | null;
  station_code: string;
  station_kind: string;
  station_active: boolean;
  batch_id: string | null;
  batch_code: string;
  batch_status: string;
  model_id: string;
  steps: RecipeStep[];
  done_step_ids: string[];
}

/**
 * Station, batch and the batch's recipe with the steps already done, and the scanned container
 * with its lot, material and row version, in one statement (no transaction: the write checks the
 * version): a step is done when its latest whole-batch run has finished (as batchProgress reads
 * it). `containerCode` null (a mix, or no container) fetches no container.
 */
interface ContextValues {
  stationId: string;
  batchId: string;
  containerCode: string | null;
  /** The request's Idempotency-Key to claim in this statement (all null: none). */
  idemKey: string | null;
  idemActor: string | null;
  idemMethod: string | null;
  idemPath: string | null;
  idemHash: string | null;
}

const contextStatement = (name: string, lock: boolean) =>
  namedStatement<ContextValues, LoadContextRow>(
    name,
    sql`
    WITH claim AS (
      INSERT INTO idempotency_keys (key, actor_id, method, path, request_hash)
      SELECT ${sql.placeholder('idemKey')}::text, ${sql.placeholder('idemActor')}::uuid, ${sql.placeholder('idemMethod')}::text, ${sql.placeholder('idemPath')}::text, ${sql.placeholder('idemHash')}::text
      WHERE ${sql.placeholder('idemKey')}::text IS NOT NULL
      ON CONFLICT DO NOTHING
      RETURNING key
    ),
    scanned AS MATERIALIZED (
      SELECT ${rowJson(containers, 'c')} AS container, ${rowJson(lots, 'l')} AS lot, ${rowJson(materials, 'm')} AS material,
             c.xmin::text AS version
      FROM containers c JOIN lots l ON l.id = c.lot_id JOIN materials m ON m.id = l.material_id
      WHERE c.code = ${sql.placeholder('containerCode')}::text
      ${lock ? sql`FOR UPDATE OF c` : sql``}
    )
    SELECT CASE WHEN ${sql.placeholder('idemKey')}::text IS NOT NULL THEN (SELECT count(*) FROM claim)::int END AS claimed,
           scanned.container, scanned.lot, scanned.material, scanned.version AS container_version,
           st.id AS station_id, st.code AS station_code, st.kind AS station_kind, st.active AS station_active,
           b.id AS batch_id, b.code AS batch_code, b.status AS batch_status, b.model_id,
           (SELECT coalesce(json_agg(json_build_object(
                     'id', rs.id, 'seq', rs.seq, 'name', rs.name, 'stationKind', rs.station_kind, 'waitForCure', rs.wait_for_cure,
                     'materials', (SELECT coalesce(json_agg(json_build_object('materialId', rsm.material_id, 'amountPerUnit', rsm.amount_per_unit::float8)), '[]')
                                   FROM recipe_step_materials rsm WHERE rsm.step_id = rs.id)) ORDER BY rs.seq), '[]')
              FROM recipe_steps rs WHERE rs.model_id = b.model_id) AS steps,
           ARRAY(SELECT last.step_id FROM (
                   SELECT DISTINCT ON (sr.step_id) sr.step_id, sr.finished_at FROM step_runs sr
                   WHERE sr.batch_id = b.id AND sr.driver_id IS NULL ORDER BY sr.step_id, sr.started_at DESC) last
                 WHERE last.finished_at IS NOT NULL) AS done_step_ids
    FROM (SELECT 1) one
    LEFT JOIN stations st ON st.id = ${sql.placeholder('stationId')}::uuid
    LEFT JOIN build_batches b ON b.id = ${sql.placeholder('batchId')}::uuid
    LEFT JOIN scanned ON true`,
  );

/** As read (the write checks the version), or with the container locked (inside a transaction). */
const loadContextStatement = contextStatement('load_context', false);
const loadContextLockedStatement = contextStatement('load_context_locked', true);

async function loadContext(
  tx: DbOrTx,
  lock: boolean,
  stationId: string,
  batchId: string,
  containerCode: string | null,
  idem: HandlerClaimedKey | undefined,
) {
  const claim = idem && !idem.claimed ? idem : null;
  const [r] = await (lock ? loadContextLockedStatement : loadContextStatement)(tx, {
    stationId,
    batchId,
    containerCode,
    idemKey: claim?.key ?? null,
    idemActor: claim?.actorId ?? null,
    idemMethod: claim?.method ?? null,
    idemPath: claim?.path ?? null,
    idemHash: claim?.requestHash ?? null,
  });
  if (claim) {
    if (r.claimed === 0) return KEY_TAKEN;
    claim.claimed = true;
  }
  if (!r.station_id) throw notFound('The station');
  const station: StationRow = { id: r.station_id, code: r.station_code, kind: r.station_kind, active: r.station_active };
  if (!station.active) {
    throw conflict('STATION_RETIRED', `Station ${station.code} is retired; nothing can be loaded there. Use an active station.`);
  }
  if (!r.batch_id) throw notFound('The build batch');
  const batch = { id: r.batch_id, code: r.batch_code, status: r.batch_status, modelId: r.model_id };
  const done = new Set(r.done_step_ids);
  const container = rowFromJson(containers, r.container);
  const scanned: (ContainerContext & { version: string }) | null = container
    ? { container, lot: rowFromJson(lots, r.lot)!, material: rowFromJson(materials, r.material)!, version: r.container_version! }
    : null;
  return { station, batch, steps: r.steps, pending: r.steps.filter((s) => !done.has(s.id)), scanned };
}

interface LoadWriteRow {
  /** False when the container changed since it was read (nothing was written): check again. */
  ok: boolean;
  /** 1 when the answer was stored for the Idempotency-Key with the writes. */
  stored: number;
  load: (Omit<LoadRow, 'loadedAt' | 'unloadedAt'> & { loadedAt: string; unloadedAt: string | null }) | null;
  inserted: boolean | null;
}

interface LoadWriteValues {
  actorId: string;
  stationId: string;
  stationCode: string;
  batchId: string;
  containerId: string | null;
  /** The container's row version its checks read (null for a mix). */
  containerVersion: string | null;
  mixId: string | null;
  openContainer: boolean;
  now: string;
  /** The new load's id (made here, so its answer is known before the write). */
  loadId: string;
  /** Store `answer` (JSON) as the answer to this Idempotency-Key when the load is new (nulls: no). */
  idemKey: string | null;
  idemActor: string | null;
  answer: string | null;
}

/**
 * The writes of a load in one statement, on its own (no transaction around the read and the
 * checks): first the container row is updated only if it is still the version the checks read
 * (opened now if it was sealed, otherwise only given a new version) — that row lock also makes a
 * concurrent load of the same container wait, then find the version changed and check again.
 * Then, only if that went through (or for a mix): the opening's audit, the load unless the same
 * thing is already loaded for this batch here (with its audit), and the genealogy of a step
 * running here for the batch. Data-modifying CTEs all run, each once; the audit rows are sealed
 * into the chain at the statement's commit.
 */
const loadWriteStatement = namedStatement<LoadWriteValues, LoadWriteRow>(
  'load_write',
  sql`
    WITH touched AS (
      UPDATE containers
      SET status = CASE WHEN ${sql.placeholder('openContainer')}::boolean THEN 'open' ELSE status END,
          opened_at = CASE WHEN ${sql.placeholder('openContainer')}::boolean THEN ${sql.placeholder('now')}::timestamptz ELSE opened_at END,
          updated_at = CASE WHEN ${sql.placeholder('openContainer')}::boolean THEN ${sql.placeholder('now')}::timestamptz ELSE updated_at END
      WHERE id = ${sql.placeholder('containerId')}::uuid AND xmin::text = ${sql.placeholder('containerVersion')}::text
      RETURNING id
    ),
    go AS (
      SELECT (${sql.placeholder('containerId')}::uuid IS NULL OR EXISTS (SELECT 1 FROM touched)) AS ok
    ),
    opened_audit AS (
      INSERT INTO audit_log (actor_id, action, entity_type, entity_id, before, after, reason)
      SELECT ${sql.placeholder('actorId')}::uuid, 'container.open', 'container', id::text, '{"status":"sealed","openedAt":null}'::jsonb,
             jsonb_build_object('status', 'open', 'openedAt', ${sql.placeholder('now')}::text), 'loaded at station ' || ${sql.placeholder('stationCode')}::text
      FROM touched WHERE ${sql.placeholder('openContainer')}::boolean
    ),
    existing AS (
      SELECT * FROM station_loads
      WHERE station_id = ${sql.placeholder('stationId')}::uuid AND batch_id = ${sql.placeholder('batchId')}::uuid AND unloaded_at IS NULL
        AND (container_id = ${sql.placeholder('containerId')}::uuid OR mix_id = ${sql.placeholder('mixId')}::uuid)
        AND (SELECT ok FROM go)
      LIMIT 1
    ),
    inserted AS (
      INSERT INTO station_loads (id, station_id, batch_id, container_id, mix_id, loaded_at, loaded_by)
      SELECT ${sql.placeholder('loadId')}::uuid, ${sql.placeholder('stationId')}::uuid, ${sql.placeholder('batchId')}::uuid, ${sql.placeholder('containerId')}::uuid, ${sql.placeholder('mixId')}::uuid,
             ${sql.placeholder('now')}::timestamptz, ${sql.placeholder('actorId')}::uuid
      WHERE (SELECT ok FROM go) AND NOT EXISTS (SELECT 1 FROM existing)
      RETURNING *
    ),
    load_audit AS (
      INSERT INTO audit_log (actor_id, action, entity_type, entity_id, after)
      SELECT ${sql.placeholder('actorId')}::uuid, 'station.load', 'station_load', id::text,
             jsonb_build_object('stationId', station_id, 'batchId', batch_id, 'containerId', container_id, 'mixId', mix_id, 'loadedAt', ${sql.placeholder('now')}::text)
      FROM inserted
    ),
    stored AS (
      UPDATE idempotency_keys SET status_code = 200, response_body = ${sql.placeholder('answer')}::jsonb
      WHERE ${sql.placeholder('answer')}::text IS NOT NULL AND actor_id = ${sql.placeholder('idemActor')}::uuid AND key = ${sql.placeholder('idemKey')}::text
        AND EXISTS (SELECT 1 FROM inserted)
      RETURNING 1
    ),
    -- A container swapped in while a step runs here belongs to that run's genealogy too.
    genealogy AS (
      INSERT INTO step_run_materials (step_run_id, container_id, mix_id, loaded_at, loaded_by)
      SELECT sr.id, i.container_id, i.mix_id, i.loaded_at, i.loaded_by
      FROM inserted i JOIN step_runs sr ON sr.batch_id = i.batch_id AND sr.station_id = i.station_id AND sr.finished_at IS NULL
    )
    SELECT go.ok, (SELECT count(*) FROM stored)::int AS stored,
           CASE WHEN l.id IS NOT NULL THEN
             json_build_object('id', l.id, 'stationId', l.station_id, 'batchId', l.batch_id, 'containerId', l.container_id, 'mixId', l.mix_id,
                               'loadedAt', l.loaded_at, 'loadedBy', l.loaded_by, 'unloadedAt', l.unloaded_at) END AS load,
           l.inserted
    FROM go LEFT JOIN (SELECT *, true AS inserted FROM inserted UNION ALL SELECT *, false FROM existing) l ON true`,
);

async function writeLoad(tx: DbOrTx, a: Omit<LoadWriteValues, 'now'> & { now: Date }): Promise<LoadWriteRow> {
  const [row] = await loadWriteStatement(tx, { ...a, now: a.now.toISOString() });
  return row;
}

/** The step of the batch this station would run next; WRONG_STATION when the batch has none here. */
export function stepAtStation(station: StationRow, batchCode: string, pending: RecipeStep[]): RecipeStep {
  const step = pending.find((s) => s.stationKind === station.kind);
  if (!step) {
    const next = pending[0];
    throw conflict(
      'WRONG_STATION',
      next
        ? `Batch ${batchCode} has no step left at a ${kindWords(station.kind)} station (${station.code}); its next step is "${next.name}" at a ${kindWords(next.stationKind)} station. Take the batch there.`
        : `Batch ${batchCode} has finished all its steps; nothing more runs at ${station.code}.`,
      { stationKind: station.kind, nextStepId: next?.id ?? null },
    );
  }
  return step;
}

/**
 * A rework load: the driver must belong to the batch and have failed (or be under rework); the
 * step is the one named, or the first of the recipe run at this station's kind.
 */
async function reworkStep(
  tx: DbOrTx,
  station: StationRow,
  batch: { id: string; code: string },
  steps: RecipeStep[],
  serial: string,
  stepId?: string,
): Promise<RecipeStep> {
  const [driver] = await tx.select().from(drivers).where(eq(drivers.serial, serial));
  if (!driver)
    throw new AppError('NOT_FOUND', `No driver has the serial "${serial}".`, 404, [{ field: 'serial', message: 'is not known' }]);
  if (driver.batchId !== batch.id) {
    throw conflict('WRONG_BATCH', `Driver ${driver.serial} belongs to another batch, not ${batch.code}. Scan the driver's own batch.`);
  }
  if (driver.status !== 'failed' && driver.status !== 'reworked') {
    throw conflict(
      'NOT_FOR_REWORK',
      `Driver ${driver.serial} is ${driver.status.replace('_', ' ')}; only a driver that failed final test is reworked.`,
    );
  }
  const step = stepId ? steps.find((s) => s.id === stepId) : steps.find((s) => s.stationKind === station.kind);
  if (!step) {
    if (stepId)
      throw new AppError('NOT_FOUND', "That recipe step is not part of this batch's model.", 404, [
        { field: 'stepId', message: 'is not a step of this model' },
      ]);
    throw conflict(
      'WRONG_STATION',
      `No step of batch ${batch.code}'s recipe runs at a ${kindWords(station.kind)} station (${station.code}).`,
      { stationKind: station.kind },
    );
  }
  if (step.stationKind !== station.kind) {
    throw conflict(
      'WRONG_STATION',
      `Step "${step.name}" runs at a ${kindWords(step.stationKind)} station, not at ${station.code} (${kindWords(station.kind)}).`,
      { stationKind: station.kind },
    );
  }
  return step;
}

async function namesOf(tx: DbOrTx, ids: string[]): Promise<string> {
  const rows = ids.length
    ? await tx.select({ id: materials.id, name: materials.name }).from(materials).where(inArray(materials.id, ids))
    : [];
  const names = ids.map((id) => rows.find((r) => r.id === id)?.name ?? id);
  return names.length ? names.join(' or ') : 'no material';
}

/** WRONG_MATERIAL unless one of the scanned materials is in the step's recipe. */
async function checkMaterialForStep(tx: DbOrTx, step: RecipeStep, scanned: MaterialRow[], what: string): Promise<void> {
  const wanted = step.materials.map((m) => m.materialId);
  if (scanned.some((m) => wanted.includes(m.id))) return;
  throw conflict(
    'WRONG_MATERIAL',
    `Wrong material: ${what} is ${scanned.map((m) => m.name).join(' + ')}, but step "${step.name}" uses ${await namesOf(tx, wanted)}. Take it out and load the right material.`,
    { scannedMaterialIds: scanned.map((m) => m.id), expectedMaterialIds: wanted, stepId: step.id },
  );
}

/**
 * POST /api/stations/:id/load — checks everything first (a refusal changes nothing), then opens
 * a sealed container (its after-opening life starts now) and records the load.
 *
 * First without a transaction — two round trips: the context with the container as read, then
 * the writes, which go ahead only on the container version the checks read. When the container
 * changed in between (another load of it, a use, a status change), nothing was written, and the
 * load is read and checked again inside a transaction holding the container's row lock, which
 * always gets through. A mix or a rework adds its look-ups.
 */
export async function loadAtStation(
  actor: Actor,
  stationId: string,
  input: LoadInput,
  idem?: HandlerClaimedKey,
  now: Date = new Date(),
): Promise<LoadResult | typeof KEY_TAKEN> {
  requirePermission(actor, 'stations.load');
  const containerCode = input.containerCode ? scannedContainerCode(input.containerCode) : null;
  const result =
    (await tryLoad(db, false, actor, stationId, input, containerCode, idem, now)) ??
    (await db.transaction((tx) => tryLoad(tx, true, actor, stationId, input, containerCode, idem, now)));
  if (result) return result;
  // Not reached while the row lock holds the version; a refusal rather than a silent retry loop.
  throw new AppError('TRY_AGAIN', 'The container changed while this load was checked; scan it again.', 409);
}

/**
 * One read, check and write; null when the container changed before the write (nothing
 * written). With `idem`, the context statement claims the request's Idempotency-Key (KEY_TAKEN
 * when it was taken) and, for a new container load, the write statement stores the answer.
 */
async function tryLoad(
  tx: DbOrTx,
  lock: boolean,
  actor: Actor,
  stationId: string,
  input: LoadInput,
  containerCode: string | null,
  idem: HandlerClaimedKey | undefined,
  now: Date,
): Promise<LoadResult | typeof KEY_TAKEN | null> {
  const context = await loadContext(tx, lock, stationId, input.batchId, containerCode, idem);
  if (context === KEY_TAKEN) return KEY_TAKEN;
  const { station, batch, steps, pending, scanned } = context;
  checkBatchOpen(batch, Boolean(input.serial));
  const step = input.serial
    ? await reworkStep(tx, station, batch, steps, input.serial, input.stepId)
    : stepAtStation(station, batch.code, pending);
  const stepRef = { id: step.id, seq: step.seq, name: step.name };
  const loadId = crypto.randomUUID();

  if (containerCode !== null) {
    if (!scanned) throw unknownCode('containerCode', 'container', containerCode);
    const c = scanned;
    await checkMaterialForStep(tx, step, [c.material], `container ${c.container.code}`);
    checkContainerUsable(c.container, c.lot, c.material, now);
    const opened = c.container.status === 'sealed';
    // Described from what this request already holds (the container as opened just now), so
    // the answer for a new load is known before the write, which stores it with the load.
    const container = opened ? { ...c.container, status: 'open' as const, openedAt: now, updatedAt: now } : c.container;
    const part = containerPart({ ...c, container }, now);
    const answer = (l: { id: string; loadedAt: Date; loadedBy: string | null }, alreadyLoaded: boolean): LoadResult => ({
      id: l.id,
      stationId: station.id,
      batchId: batch.id,
      batchCode: batch.code,
      loadedAt: l.loadedAt.toISOString(),
      loadedBy: l.loadedBy,
      ...part,
      accepted: true as const,
      step: stepRef,
      opened,
      alreadyLoaded,
    });
    const fresh = answer({ id: loadId, loadedAt: now, loadedBy: actor.id }, false);
    const written = await writeLoad(tx, {
      actorId: actor.id,
      stationId: station.id,
      stationCode: station.code,
      batchId: batch.id,
      containerId: c.container.id,
      containerVersion: c.version,
      mixId: null,
      openContainer: opened,
      now,
      loadId,
      idemKey: idem?.key ?? null,
      idemActor: idem?.actorId ?? null,
      answer: idem ? JSON.stringify(fresh) : null,
    });
    if (!written.ok) return null;
    if (idem && written.stored === 1) idem.stored = true;
    if (written.inserted) return fresh;
    const l = written.load!;
    return answer({ id: l.id, loadedAt: new Date(l.loadedAt), loadedBy: l.loadedBy }, true);
  }

  const m = await mixByCode(tx, input.mixCode!, 'mixCode');
  await checkMaterialForStep(tx, step, [m.resin.material, m.hardener.material], `mix ${m.mix.code}`);
  checkMixUsable(m.mix, [m.resin, m.hardener], now);
  // A mix's answer is described after the write (its parts' lots and materials): the
  // idempotency middleware stores it.
  const written = await writeLoad(tx, {
    actorId: actor.id,
    stationId: station.id,
    stationCode: station.code,
    batchId: batch.id,
    containerId: null,
    containerVersion: null,
    mixId: m.mix.id,
    openContainer: false,
    now,
    loadId,
    idemKey: null,
    idemActor: null,
    answer: null,
  });
  const l = written.load!;
  const [described] = await describeLoads(
    tx,
    [{ ...l, loadedAt: new Date(l.loadedAt), unloadedAt: l.unloadedAt ? new Date(l.unloadedAt) : null }],
    now,
  );
  return { ...described, accepted: true as const, step: stepRef, opened: false, alreadyLoaded: !written.inserted };
}

/**
 * The station load's two statements, as loadAtStation runs them (context with the key's claim,
 * then the writes): for the benchmark's ceiling (scripts/bench/bare-express.ts), which runs them
 * behind a bare Express route to show what the load's database work allows on a machine.
 */
export const loadStatementsForBenchmark = { context: loadContextStatement, write: writeLoad };
