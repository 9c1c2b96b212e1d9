/**
 * Value lists shared by the database enums, the zod schemas and the client.
 * Changing one of these needs a migration (`npm run db:generate -- --name <what>`).
 */
export const ROLES = ['admin', 'receiving', 'assembler', 'quality', 'purchasing'] as const;
export type Role = (typeof ROLES)[number];

export const MATERIAL_KINDS = [
  'adhesive',
  'activator',
  'hardener',
  'wire',
  'magnet',
  'cone',
  'spider',
  'dust_cap',
  'frame',
  'other',
] as const;
export type MaterialKind = (typeof MATERIAL_KINDS)[number];

export const STORAGE_CLASSES = ['ambient', 'refrigerated', 'frozen'] as const;
export type StorageClass = (typeof STORAGE_CLASSES)[number];

export const LOT_STATUSES = ['on_hold', 'released', 'quarantined', 'rejected', 'used_up'] as const;
export type LotStatus = (typeof LOT_STATUSES)[number];

export const CONTAINER_STATUSES = ['sealed', 'open', 'empty', 'scrapped'] as const;
export type ContainerStatus = (typeof CONTAINER_STATUSES)[number];

export const MIX_STATUSES = ['active', 'used_up', 'discarded'] as const;
export type MixStatus = (typeof MIX_STATUSES)[number];

export const BATCH_STATUSES = ['open', 'in_process', 'completed', 'cancelled'] as const;
export type BatchStatus = (typeof BATCH_STATUSES)[number];

export const DRIVER_STATUSES = ['in_process', 'passed', 'failed', 'reworked', 'scrapped'] as const;
export type DriverStatus = (typeof DRIVER_STATUSES)[number];

export const TEST_RESULTS = ['pass', 'fail'] as const;
export type TestResult = (typeof TEST_RESULTS)[number];

export const ALERT_SEVERITIES = ['info', 'warning', 'critical'] as const;
export type AlertSeverity = (typeof ALERT_SEVERITIES)[number];

export const ALERT_STATES = ['open', 'acknowledged', 'resolved'] as const;
export type AlertState = (typeof ALERT_STATES)[number];

export const ALERT_KINDS = [
  'pot_life_exceeded',
  'short_cure',
  'expired_in_stock',
  'expiring_soon',
  'quarantine_advised',
  'below_reorder_point',
  'audit_chain_broken',
  'lamp_check_due',
  'humidity_out_of_window',
] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];

export const STEP_RUN_KINDS = ['build', 'rework'] as const;
export type StepRunKind = (typeof STEP_RUN_KINDS)[number];

export const ATTACHMENT_KINDS = ['certificate', 'sds', 'other'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];

/** queued → sending (claimed by a worker, under a lease) → sent | queued again (retry later) | failed. */
export const EMAIL_STATUSES = ['queued', 'sending', 'sent', 'failed'] as const;
export type EmailStatus = (typeof EMAIL_STATUSES)[number];

/** What an outgoing e-mail is about. */
export const EMAIL_KINDS = ['alert', 'alert_resolved', 'digest', 'password_reset', 'other'] as const;
export type EmailKind = (typeof EMAIL_KINDS)[number];

/** GHS pictogram codes (UN GHS, Annex 3). */
export const GHS_PICTOGRAMS = ['GHS01', 'GHS02', 'GHS03', 'GHS04', 'GHS05', 'GHS06', 'GHS07', 'GHS08', 'GHS09'] as const;
export type GhsPictogram = (typeof GHS_PICTOGRAMS)[number];
