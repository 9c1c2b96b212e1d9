/** How an audit entry reads in a lot's history. */

export interface FieldChange {
  field: string;
  /** null when the record was created (no earlier value). */
  from: string | null;
  to: string;
}

const ACTION_TEXT: Record<string, string> = {
  'lot.receive': 'Received',
  'lot.status': 'Status changed',
  'lot.certificate': 'Certificate of analysis attached',
  'container.open': 'Opened',
  'container.thaw': 'Thaw recorded',
  'container.location': 'Moved',
  'container.empty': 'Emptied',
  'container.scrap': 'Scrapped',
  'container.out-of-storage': 'Taken out of cold storage',
  'container.return-to-storage': 'Back in cold storage',
  'container.load': 'Loaded at a station',
};

export function actionText(action: string): string {
  return ACTION_TEXT[action] ?? action.replace(/^[a-z]+\./, '').replace(/[-_.]/g, ' ');
}

/** A value as short text: instants as local date and time, lists by length, null as "—". */
export function valueText(value: unknown): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'string') {
    if (/^\d{4}-\d{2}-\d{2}T/.test(value)) {
      const d = new Date(value);
      if (!Number.isNaN(d.getTime())) return d.toLocaleString();
    }
    return value.replace(/_/g, ' ');
  }
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return String(value.length);
  return JSON.stringify(value);
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/**
 * The fields that changed between `before` and `after` (old → new), in the order they appear.
 * A creation (no `before`) lists only `pick` fields of `after`, so a receipt does not spill
 * every column.
 */
export function fieldChanges(before: unknown, after: unknown, pick: readonly string[] = ['status', 'supplierLot', 'containers', 'location']): FieldChange[] {
  const b = isRecord(before) ? before : null;
  const a = isRecord(after) ? after : {};
  if (!b) {
    return pick.filter((k) => k in a && a[k] !== null).map((k) => ({ field: k, from: null, to: valueText(a[k]) }));
  }
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])];
  return keys
    .filter((k) => JSON.stringify(b[k] ?? null) !== JSON.stringify(a[k] ?? null))
    .map((k) => ({ field: k, from: valueText(b[k]), to: valueText(a[k]) }));
}
