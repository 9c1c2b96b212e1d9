/**
 * How the audit page names record types and actions. Lot and container actions reuse the lot
 * history's words (historyText.ts); the rest are named here, unknown ones are split into words.
 */
import { actionText as lotActionText, fieldChanges, type FieldChange } from './history-words';
import type { AuditItem } from './schemas/audit';

export const ENTITY_WORDS: Record<string, string> = {
  lot: 'Lot',
  container: 'Container',
  material: 'Material',
  supplier: 'Supplier',
  station: 'Station',
  station_load: 'Station loading',
  driver_model: 'Driver model',
  driver: 'Driver',
  build_batch: 'Build batch',
  step_run: 'Process step',
  mix: 'Mix',
  reading: 'Shop reading',
  deviation: 'Deviation',
  defect_code: 'Defect code',
  test_result: 'Final test result',
  alert: 'Alert',
  user: 'User',
  setting: 'Setting',
  digest: 'Daily digest',
};

const ACTION_WORDS: Record<string, string> = {
  'alert.acknowledge': 'Alert acknowledged',
  'alert.clear': 'Alert cleared',
  'alert.raise': 'Alert raised',
  'alert.resolve': 'Alert resolved',
  'batch.create': 'Batch started',
  'batch.status': 'Batch status changed',
  'baseline.override': 'Baseline failure rate overridden',
  'baseline.clearOverride': 'Baseline back to the computed rate',
  'defect_code.create': 'Defect code added',
  'defect_code.update': 'Defect code changed',
  'deviation.sign': 'Deviation signed',
  'deviation.use': 'Deviation used',
  'driver.scrap': 'Driver scrapped',
  'driver.status': 'Driver status changed',
  login: 'Signed in',
  logout: 'Signed out',
  'material.create': 'Material added',
  'material.partner': 'Partner material set',
  'material.retire': 'Material retired',
  'material.sds': 'Safety data sheet attached',
  'material.update': 'Material changed',
  'mix.consume': 'Mix used',
  'mix.create': 'Mix made',
  'model.create': 'Driver model added',
  'model.makeCurrent': 'Revision made current',
  'model.revise': 'New revision',
  'model.update': 'Driver model changed',
  'notifications.change': 'Notification settings changed',
  'notifications.digest': 'Daily digest sent',
  'reading.record': 'Shop reading recorded',
  'station.create': 'Station added',
  'station.retire': 'Station retired',
  'station.unload': 'Unloaded from a station',
  'station.update': 'Station changed',
  'step.finish': 'Step finished',
  'step.start': 'Step started',
  'supplier.create': 'Supplier added',
  'supplier.retire': 'Supplier retired',
  'supplier.update': 'Supplier changed',
  'test.record': 'Final test recorded',
  'session.end': 'Session ended by its user',
  'user.create': 'User added',
  'user.deactivate': 'User deactivated (sessions ended)',
  'user.password_change': 'Password changed',
  'user.password_reset': 'Password set with a reset link',
  'user.password_reset_sent': 'Password reset link sent',
  'user.reactivate': 'User reactivated',
  'user.update': 'User changed (name or roles)',
};

/** Actions offered in the filter, in words, sorted by their words. */
export const ACTION_OPTIONS: { value: string; label: string }[] = [
  ...Object.entries(ACTION_WORDS),
  ...[
    'lot.receive',
    'lot.status',
    'lot.certificate',
    'container.open',
    'container.move',
    'container.empty',
    'container.scrap',
    'container.consume',
  ].map((a) => [a, lotActionText(a)] as [string, string]),
]
  .map(([value, label]) => ({ value, label }))
  .sort((a, b) => a.label.localeCompare(b.label));

export const ENTITY_OPTIONS = Object.entries(ENTITY_WORDS)
  .map(([value, label]) => ({ value, label }))
  .sort((a, b) => a.label.localeCompare(b.label));

export function auditActionText(action: string): string {
  return ACTION_WORDS[action] ?? lotActionText(action);
}

export function entityText(entity: string): string {
  return ENTITY_WORDS[entity] ?? entity.charAt(0).toUpperCase() + entity.slice(1).replace(/[_-]/g, ' ');
}

/** The problem the chain check reports, in words (the server's text is already plain; kept as is). */
export function verifyProblemText(problem: string): string {
  return problem.charAt(0).toUpperCase() + problem.slice(1);
}

/** Old → new in words. A creation lists what was set; an entry with only `after` and no record shape shows nothing. */
export function auditChanges(e: Pick<AuditItem, 'before' | 'after'>, zone: string): FieldChange[] {
  const after = e.after && typeof e.after === 'object' && !Array.isArray(e.after) ? (e.after as Record<string, unknown>) : {};
  const pick = e.before
    ? undefined
    : Object.keys(after)
        .filter((k) => !/(^id$|Id$|hash|sha256)/i.test(k))
        .slice(0, 8);
  return fieldChanges(e.before, e.after, { zone }, pick);
}

/** The changes on one line, for a CSV cell: "Status: On hold → Released; Reason: Passed". */
export function auditChangesLine(e: Pick<AuditItem, 'before' | 'after'>, zone: string): string {
  return auditChanges(e, zone)
    .map((c) => `${c.label}: ${c.from !== null ? `${c.from} → ` : ''}${c.to}`)
    .join('; ');
}

/** The record's own name or code when the entry carries it (a lot's supplier lot, a station's code…). */
export function auditRecordName(e: Pick<AuditItem, 'before' | 'after'>): string {
  for (const side of [e.after, e.before]) {
    if (side && typeof side === 'object' && !Array.isArray(side)) {
      const r = side as Record<string, unknown>;
      for (const key of ['supplierLot', 'code', 'serial', 'name', 'email']) if (typeof r[key] === 'string' && r[key]) return r[key];
    }
  }
  return '';
}
