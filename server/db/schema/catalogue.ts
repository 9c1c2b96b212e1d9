import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  index,
  integer,
  jsonb,
  numeric,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
  type AnyPgColumn,
} from 'drizzle-orm/pg-core';
import { materialKindEnum, storageClassEnum } from './enums';
import { attachments } from './attachments';

export interface CureProfileJson {
  refTempC: number;
  handlingMinutes: number;
  fullCureMinutes: number;
  factorPer10C?: number;
  activationEnergyKJ?: number;
  /** 'ambient' (default), 'heat' (oven schedule) or 'uv' (dose); shared/cure-methods.ts */
  method?: 'ambient' | 'heat' | 'uv';
  minTempC?: number;
  schedule?: { tempC: number; minutes: number }[];
  uvDoseMJcm2?: number;
  rhMinPct?: number;
  rhMaxPct?: number;
}

export interface HazardsJson {
  signalWord?: 'Danger' | 'Warning';
  pictograms: string[];
  statements: string[];
}

export const suppliers = pgTable(
  'suppliers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    name: text('name').notNull(),
    contactName: text('contact_name'),
    email: text('email'),
    phone: text('phone'),
    address: text('address'),
    notes: text('notes'),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('suppliers_code_uq').on(t.code), uniqueIndex('suppliers_name_lower_uq').on(sql`lower(${t.name})`)],
);

export const materials = pgTable(
  'materials',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    name: text('name').notNull(),
    kind: materialKindEnum('kind').notNull(),
    unit: text('unit').notNull(),
    storageClass: storageClassEnum('storage_class').notNull().default('ambient'),
    /** From manufacture, or from receipt when no manufacture date is known. */
    shelfLifeDays: integer('shelf_life_days'),
    /** Usable life once a container is opened. */
    openLifeHours: integer('open_life_hours'),
    /** Frozen material: allowed time after the thaw ends. */
    thawedLifeHours: integer('thawed_life_hours'),
    /** Refrigerated material: total time out of cold storage allowed. */
    outOfStorageAllowanceHours: integer('out_of_storage_allowance_hours'),
    potLifeMinutes: integer('pot_life_minutes'),
    partnerMaterialId: uuid('partner_material_id').references((): AnyPgColumn => materials.id),
    /** Parts by weight of this component per 1 part of the partner (two-part adhesives). */
    mixRatio: numeric('mix_ratio', { precision: 12, scale: 4 }),
    cure: jsonb('cure').$type<CureProfileJson>(),
    requiresInspection: boolean('requires_inspection').notNull().default(true),
    hazards: jsonb('hazards').$type<HazardsJson>().notNull().default({ pictograms: [], statements: [] }),
    sdsAttachmentId: uuid('sds_attachment_id').references(() => attachments.id),
    gtin: text('gtin'),
    reorderPoint: numeric('reorder_point', { precision: 14, scale: 3 }),
    orderQuantity: numeric('order_quantity', { precision: 14, scale: 3 }),
    leadTimeDays: integer('lead_time_days'),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('materials_code_uq').on(t.code),
    // One GTIN identifies one material (several materials may have none).
    uniqueIndex('materials_gtin_uq').on(t.gtin),
    check('materials_shelf_life_ck', sql`${t.shelfLifeDays} IS NULL OR ${t.shelfLifeDays} > 0`),
    check('materials_open_life_ck', sql`${t.openLifeHours} IS NULL OR ${t.openLifeHours} > 0`),
    check('materials_thawed_life_ck', sql`${t.thawedLifeHours} IS NULL OR ${t.thawedLifeHours} > 0`),
    check('materials_pot_life_ck', sql`${t.potLifeMinutes} IS NULL OR ${t.potLifeMinutes} > 0`),
    check('materials_lead_time_ck', sql`${t.leadTimeDays} IS NULL OR ${t.leadTimeDays} >= 0`),
    check('materials_reorder_ck', sql`${t.reorderPoint} IS NULL OR ${t.reorderPoint} >= 0`),
    check('materials_order_qty_ck', sql`${t.orderQuantity} IS NULL OR ${t.orderQuantity} > 0`),
    check('materials_partner_ck', sql`${t.partnerMaterialId} IS NULL OR ${t.partnerMaterialId} <> ${t.id}`),
  ],
);

export const stations = pgTable(
  'stations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    name: text('name').notNull(),
    /** What the station does; recipe steps name the kind of station they run at. */
    kind: text('kind').notNull(),
    /** Shop area; temperature readings are kept per area. */
    area: text('area').notNull(),
    /** 'area': cures in the area's air; 'own': an oven or UV lamp with its own readings. */
    cureEnvironment: text('cure_environment').notNull().default('area'),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('stations_code_uq').on(t.code),
    check('stations_kind_ck', sql`length(${t.kind}) > 0`),
    check('stations_cure_environment_ck', sql`${t.cureEnvironment} IN ('area', 'own')`),
  ],
);

export const driverModels = pgTable(
  'driver_models',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    name: text('name').notNull(),
    description: text('description'),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /** Recipe revision of this model code: 1, 2, … Each revision has its own steps; batches keep theirs. */
    revision: integer('revision').notNull().default(1),
    /** The revision new batches are built with; exactly one per code. */
    current: boolean('current').notNull().default(true),
  },
  (t) => [
    uniqueIndex('driver_models_code_revision_uq').on(t.code, t.revision),
    uniqueIndex('driver_models_current_uq')
      .on(t.code)
      .where(sql`${t.current}`),
    check('driver_models_revision_ck', sql`${t.revision} >= 1`),
  ],
);

export const recipeSteps = pgTable(
  'recipe_steps',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    modelId: uuid('model_id')
      .notNull()
      .references(() => driverModels.id, { onDelete: 'cascade' }),
    seq: integer('seq').notNull(),
    name: text('name').notNull(),
    stationKind: text('station_kind').notNull(),
    /** The next step may not start before this step's adhesive has cured. */
    waitForCure: boolean('wait_for_cure').notNull().default(false),
  },
  (t) => [uniqueIndex('recipe_steps_model_seq_uq').on(t.modelId, t.seq), check('recipe_steps_seq_ck', sql`${t.seq} > 0`)],
);

export const recipeStepMaterials = pgTable(
  'recipe_step_materials',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    stepId: uuid('step_id')
      .notNull()
      .references(() => recipeSteps.id, { onDelete: 'cascade' }),
    materialId: uuid('material_id')
      .notNull()
      .references(() => materials.id),
    amountPerUnit: numeric('amount_per_unit', { precision: 14, scale: 4 }).notNull(),
  },
  (t) => [
    uniqueIndex('recipe_step_materials_uq').on(t.stepId, t.materialId),
    index('recipe_step_materials_material_idx').on(t.materialId),
    check('recipe_step_materials_amount_ck', sql`${t.amountPerUnit} > 0`),
  ],
);

export const defectCodes = pgTable('defect_codes', {
  code: text('code').primaryKey(),
  description: text('description').notNull(),
  active: boolean('active').notNull().default(true),
});
