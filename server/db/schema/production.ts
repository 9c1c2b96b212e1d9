import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, jsonb, numeric, pgTable, pgView, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { batchStatusEnum, driverStatusEnum, stepRunKindEnum, testResultEnum } from './enums';
import { driverModels, recipeSteps, stations, defectCodes } from './catalogue';
import { containers, mixes } from './inventory';
import { users } from './users';

/** A group of drivers of one model built together; carries the traveler. */
export const buildBatches = pgTable(
  'build_batches',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    modelId: uuid('model_id')
      .notNull()
      .references(() => driverModels.id),
    quantity: integer('quantity').notNull(),
    status: batchStatusEnum('status').notNull().default('open'),
    createdBy: uuid('created_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    completedAt: timestamp('completed_at', { withTimezone: true }),
  },
  (t) => [
    uniqueIndex('build_batches_code_uq').on(t.code),
    index('build_batches_model_idx').on(t.modelId),
    check('build_batches_quantity_ck', sql`${t.quantity} > 0 AND ${t.quantity} <= 10000`),
  ],
);

export const drivers = pgTable(
  'drivers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    serial: text('serial').notNull(),
    batchId: uuid('batch_id')
      .notNull()
      .references(() => buildBatches.id),
    status: driverStatusEnum('status').notNull().default('in_process'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('drivers_serial_uq').on(t.serial), index('drivers_batch_idx').on(t.batchId)],
);

/** A recorded, signed decision to go on despite a rule. */
export const deviations = pgTable(
  'deviations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** What rule is set aside, e.g. 'early_start' (start before full cure). */
    kind: text('kind').notNull(),
    batchId: uuid('batch_id').references(() => buildBatches.id),
    stepId: uuid('step_id').references(() => recipeSteps.id),
    reason: text('reason').notNull(),
    /** Meaning of the signature (21 CFR 11.50): e.g. 'approval'. */
    meaning: text('meaning').notNull().default('approval'),
    signedBy: uuid('signed_by')
      .notNull()
      .references(() => users.id),
    signedAt: timestamp('signed_at', { withTimezone: true }).notNull().defaultNow(),
    usedAt: timestamp('used_at', { withTimezone: true }),
  },
  (t) => [index('deviations_batch_idx').on(t.batchId, t.stepId), check('deviations_reason_ck', sql`length(${t.reason}) >= 5`)],
);

/** A batch (or one unit, for rework) at a station: the genealogy link. */
export const stepRuns = pgTable(
  'step_runs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    batchId: uuid('batch_id')
      .notNull()
      .references(() => buildBatches.id),
    stepId: uuid('step_id')
      .notNull()
      .references(() => recipeSteps.id),
    stationId: uuid('station_id')
      .notNull()
      .references(() => stations.id),
    /** Set for a single-unit run (rework); null when the whole batch ran. */
    driverId: uuid('driver_id').references(() => drivers.id),
    kind: stepRunKindEnum('kind').notNull().default('build'),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    startedBy: uuid('started_by').references(() => users.id),
    finishedBy: uuid('finished_by').references(() => users.id),
    /** When the adhesive used here may be handled / is fully cured (computed at finish). */
    handlingAt: timestamp('handling_at', { withTimezone: true }),
    cureCompleteAt: timestamp('cure_complete_at', { withTimezone: true }),
    /** Started before the previous step's cure was complete. */
    shortCure: boolean('short_cure').notNull().default(false),
    deviationId: uuid('deviation_id').references(() => deviations.id),
    unitsDone: integer('units_done'),
    /** A UV step's finish: the exposure given, the lamp's irradiance then, the dose reached and the dose the adhesive needs. */
    exposureSeconds: numeric('exposure_seconds', { precision: 8, scale: 1 }),
    uvIrradianceMWcm2: numeric('uv_irradiance_mw_cm2', { precision: 8, scale: 2 }),
    uvDoseMJcm2: numeric('uv_dose_mj_cm2', { precision: 12, scale: 1 }),
    uvDoseNeededMJcm2: numeric('uv_dose_needed_mj_cm2', { precision: 12, scale: 1 }),
  },
  (t) => [
    index('step_runs_batch_idx').on(t.batchId, t.stepId),
    index('step_runs_driver_idx').on(t.driverId),
    index('step_runs_station_idx').on(t.stationId, t.finishedAt),
    check('step_runs_finish_ck', sql`${t.finishedAt} IS NULL OR ${t.finishedAt} >= ${t.startedAt}`),
  ],
);

/** Which container or mix a step run used, and how much of it. */
export const stepRunMaterials = pgTable(
  'step_run_materials',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    stepRunId: uuid('step_run_id')
      .notNull()
      .references(() => stepRuns.id),
    containerId: uuid('container_id').references(() => containers.id),
    mixId: uuid('mix_id').references(() => mixes.id),
    quantityUsed: numeric('quantity_used', { precision: 14, scale: 3 }).notNull().default('0'),
    loadedAt: timestamp('loaded_at', { withTimezone: true }).notNull().defaultNow(),
    loadedBy: uuid('loaded_by').references(() => users.id),
  },
  (t) => [
    index('step_run_materials_run_idx').on(t.stepRunId),
    index('step_run_materials_container_idx').on(t.containerId),
    index('step_run_materials_mix_idx').on(t.mixId),
    check('step_run_materials_one_ck', sql`(${t.containerId} IS NULL) <> (${t.mixId} IS NULL)`),
    check('step_run_materials_qty_ck', sql`${t.quantityUsed} >= 0`),
  ],
);

/** What is loaded at a station for a batch, before and while a step runs. */
export const stationLoads = pgTable(
  'station_loads',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    stationId: uuid('station_id')
      .notNull()
      .references(() => stations.id),
    batchId: uuid('batch_id')
      .notNull()
      .references(() => buildBatches.id),
    containerId: uuid('container_id').references(() => containers.id),
    mixId: uuid('mix_id').references(() => mixes.id),
    loadedAt: timestamp('loaded_at', { withTimezone: true }).notNull().defaultNow(),
    loadedBy: uuid('loaded_by').references(() => users.id),
    unloadedAt: timestamp('unloaded_at', { withTimezone: true }),
  },
  (t) => [
    index('station_loads_station_idx').on(t.stationId, t.unloadedAt),
    // One active load of a container or mix per batch and station, even when loads race.
    uniqueIndex('station_loads_active_container_uq')
      .on(t.stationId, t.batchId, t.containerId)
      .where(sql`${t.unloadedAt} IS NULL AND ${t.containerId} IS NOT NULL`),
    uniqueIndex('station_loads_active_mix_uq')
      .on(t.stationId, t.batchId, t.mixId)
      .where(sql`${t.unloadedAt} IS NULL AND ${t.mixId} IS NOT NULL`),
    // "Is this container (mix) loaded now?": one index entry per open load, whatever the history.
    index('station_loads_open_container_idx')
      .on(t.containerId)
      .where(sql`${t.unloadedAt} IS NULL`),
    index('station_loads_open_mix_idx')
      .on(t.mixId)
      .where(sql`${t.unloadedAt} IS NULL`),
    check('station_loads_one_ck', sql`(${t.containerId} IS NULL) <> (${t.mixId} IS NULL)`),
  ],
);

export const testResults = pgTable(
  'test_results',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    driverId: uuid('driver_id')
      .notNull()
      .references(() => drivers.id),
    result: testResultEnum('result').notNull(),
    defectCode: text('defect_code').references(() => defectCodes.code),
    measurements: jsonb('measurements').$type<Record<string, number>>(),
    testedAt: timestamp('tested_at', { withTimezone: true }).notNull().defaultNow(),
    testedBy: uuid('tested_by').references(() => users.id),
  },
  (t) => [
    index('test_results_driver_idx').on(t.driverId, t.testedAt),
    // Tests of one plant day (the quality home page's failures today) without reading every test.
    index('test_results_tested_at_idx').on(t.testedAt),
    check('test_results_defect_ck', sql`${t.result} = 'pass' OR ${t.defectCode} IS NOT NULL`),
  ],
);

/** Shop conditions: temperature and humidity per area. */
export const readings = pgTable(
  'readings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** The shop area read; null for a station's own reading (an oven, a UV lamp). */
    area: text('area'),
    stationId: uuid('station_id').references(() => stations.id),
    at: timestamp('at', { withTimezone: true }).notNull(),
    /** Null only for a radiometer reading that gives irradiance alone. */
    tempC: numeric('temp_c', { precision: 5, scale: 2 }),
    rhPct: numeric('rh_pct', { precision: 5, scale: 2 }),
    /** A UV lamp's irradiance from a radiometer, mW/cm². */
    irradianceMWcm2: numeric('irradiance_mw_cm2', { precision: 8, scale: 2 }),
    source: text('source').notNull().default('manual'),
    recordedBy: uuid('recorded_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('readings_area_at_idx').on(t.area, t.at),
    index('readings_station_at_idx').on(t.stationId, t.at),
    check('readings_temp_ck', sql`${t.tempC} IS NULL OR ${t.tempC} BETWEEN -60 AND 400`),
    check('readings_rh_ck', sql`${t.rhPct} IS NULL OR ${t.rhPct} BETWEEN 0 AND 100`),
    check('readings_irradiance_ck', sql`${t.irradianceMWcm2} IS NULL OR ${t.irradianceMWcm2} >= 0`),
    check('readings_place_ck', sql`(${t.area} IS NULL) <> (${t.stationId} IS NULL)`),
    check('readings_value_ck', sql`${t.tempC} IS NOT NULL OR ${t.irradianceMWcm2} IS NOT NULL`),
  ],
);

/**
 * The genealogy walk (view made by the hand-written migration genealogy_material_uses): every
 * container a step run used, directly (mix columns null) or as the resin or hardener of a mix.
 * One row per (step_run_materials row, container). `.existing()`: drizzle-kit does not manage it.
 */
export const materialUses = pgView('material_uses', {
  useId: uuid('use_id').notNull(),
  stepRunId: uuid('step_run_id').notNull(),
  loadedAt: timestamp('loaded_at', { withTimezone: true }).notNull(),
  quantityUsed: numeric('quantity_used', { precision: 14, scale: 3 }).notNull(),
  containerId: uuid('container_id').notNull(),
  mixId: uuid('mix_id'),
  mixCode: text('mix_code'),
  mixedAt: timestamp('mixed_at', { withTimezone: true }),
  part: text('part').$type<'resin' | 'hardener'>(),
  partOrd: integer('part_ord').notNull(),
}).existing();

/**
 * Final-test outcomes counted per batch, kept by triggers on drivers and test_results
 * (migration batch_outcomes): drivers built, drivers tested at least once, drivers that failed
 * at least once. The lot statistics (and the compliance watch) read these few rows instead of
 * every driver and test of a year.
 */
export const batchOutcomes = pgTable('batch_outcomes', {
  batchId: uuid('batch_id')
    .primaryKey()
    .references(() => buildBatches.id),
  drivers: integer('drivers').notNull().default(0),
  tested: integer('tested').notNull().default(0),
  failed: integer('failed').notNull().default(0),
});
