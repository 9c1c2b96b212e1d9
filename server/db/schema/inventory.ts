import { sql } from 'drizzle-orm';
import { check, date, index, integer, numeric, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { containerStatusEnum, lotStatusEnum, mixStatusEnum } from './enums';
import { materials, stations, suppliers } from './catalogue';
import { attachments } from './attachments';
import { users } from './users';

/** One supplier lot of one material as received (ISA-95 material lot). */
export const lots = pgTable(
  'lots',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    materialId: uuid('material_id')
      .notNull()
      .references(() => materials.id),
    supplierId: uuid('supplier_id')
      .notNull()
      .references(() => suppliers.id),
    supplierLot: text('supplier_lot').notNull(),
    gtin: text('gtin'),
    status: lotStatusEnum('status').notNull().default('on_hold'),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    manufacturedOn: date('manufactured_on'),
    expiresOn: date('expires_on'),
    certificateId: uuid('certificate_id').references(() => attachments.id),
    /** Expiry date printed on the certificate of analysis, when it has one. */
    certificateExpiresOn: date('certificate_expires_on'),
    notes: text('notes'),
    receivedBy: uuid('received_by').references(() => users.id),
    statusReason: text('status_reason'),
    statusChangedAt: timestamp('status_changed_at', { withTimezone: true }),
    statusChangedBy: uuid('status_changed_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('lots_material_idx').on(t.materialId),
    index('lots_supplier_lot_idx').on(t.materialId, t.supplierLot),
    index('lots_status_idx').on(t.status),
    index('lots_expires_idx').on(t.expiresOn),
    check('lots_supplier_lot_ck', sql`length(${t.supplierLot}) > 0`),
  ],
);

/** One labelled unit of a lot (ISA-95 sublot): cartridge, can, spool, box. */
export const containers = pgTable(
  'containers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    lotId: uuid('lot_id')
      .notNull()
      .references(() => lots.id),
    seq: integer('seq').notNull(),
    quantity: numeric('quantity', { precision: 14, scale: 3 }).notNull(),
    remaining: numeric('remaining', { precision: 14, scale: 3 }).notNull(),
    status: containerStatusEnum('status').notNull().default('sealed'),
    openedAt: timestamp('opened_at', { withTimezone: true }),
    thawedAt: timestamp('thawed_at', { withTimezone: true }),
    /** Refrigerated material: minutes spent out of cold storage so far. */
    outOfStorageMinutes: integer('out_of_storage_minutes').notNull().default(0),
    /** Set while the container is out of cold storage. */
    outOfStorageSince: timestamp('out_of_storage_since', { withTimezone: true }),
    location: text('location'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('containers_code_uq').on(t.code),
    uniqueIndex('containers_lot_seq_uq').on(t.lotId, t.seq),
    check('containers_quantity_ck', sql`${t.quantity} > 0`),
    check('containers_remaining_ck', sql`${t.remaining} >= 0 AND ${t.remaining} <= ${t.quantity}`),
    check('containers_seq_ck', sql`${t.seq} > 0`),
    check('containers_out_minutes_ck', sql`${t.outOfStorageMinutes} >= 0`),
  ],
);

/** A two-part batch mixed from two containers at a station; pot life runs from mixedAt. */
export const mixes = pgTable(
  'mixes',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    stationId: uuid('station_id')
      .notNull()
      .references(() => stations.id),
    resinContainerId: uuid('resin_container_id')
      .notNull()
      .references(() => containers.id),
    hardenerContainerId: uuid('hardener_container_id')
      .notNull()
      .references(() => containers.id),
    resinQuantity: numeric('resin_quantity', { precision: 14, scale: 3 }).notNull(),
    hardenerQuantity: numeric('hardener_quantity', { precision: 14, scale: 3 }).notNull(),
    remaining: numeric('remaining', { precision: 14, scale: 3 }).notNull(),
    mixedAt: timestamp('mixed_at', { withTimezone: true }).notNull().defaultNow(),
    /** Pot-life end computed at mixing from the area's temperature. */
    potLifeEndsAt: timestamp('pot_life_ends_at', { withTimezone: true }).notNull(),
    tempC: numeric('temp_c', { precision: 5, scale: 2 }),
    status: mixStatusEnum('status').notNull().default('active'),
    mixedBy: uuid('mixed_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('mixes_code_uq').on(t.code),
    index('mixes_resin_idx').on(t.resinContainerId),
    index('mixes_hardener_idx').on(t.hardenerContainerId),
    index('mixes_station_idx').on(t.stationId, t.status),
    check('mixes_parts_ck', sql`${t.resinContainerId} <> ${t.hardenerContainerId}`),
    check('mixes_quantity_ck', sql`${t.resinQuantity} > 0 AND ${t.hardenerQuantity} > 0`),
    check('mixes_remaining_ck', sql`${t.remaining} >= 0`),
  ],
);
