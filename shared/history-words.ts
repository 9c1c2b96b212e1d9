/**
 * How an audit entry reads in a lot's history, on the audit page and in the audit CSV: actions and fields in words, statuses as their
 * labels, times in plant time, ids as the thing's name or code (the history answer carries
 * them), and internal bookkeeping (checksums, raw ids) left out.
 */
import { formatDateTime, formatDuration } from './plant-time';
import {
  ALERT_KIND_WORDS,
  ALERT_SEVERITY_WORDS,
  ALERT_STATE_WORDS,
  CONTAINER_STATUS_WORDS,
  LOT_STATUS_WORDS,
  MATERIAL_KIND_WORDS,
  STATION_KIND_WORDS,
  STORAGE_CLASS_WORDS,
  humanize,
} from './words';

export interface FieldChange {
  field: string;
  /** The field in words ("Reason", "Opened"). */
  label: string;
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
  'container.move': 'Moved',
  'container.location': 'Moved',
  'container.empty': 'Emptied',
  'container.scrap': 'Scrapped',
  'container.consume': 'Material used',
  'container.out_of_storage': 'Taken out of cold storage',
  'container.out-of-storage': 'Taken out of cold storage',
  'container.return_to_storage': 'Back in cold storage',
  'container.return-to-storage': 'Back in cold storage',
  'container.load': 'Loaded at a station',
};

/** What each audited field of a lot or container is called on screen; `null` = not shown. */
const FIELD_LABELS: Record<string, string | null> = {
  status: 'Status',
  statusReason: 'Reason',
  supplierLot: 'Supplier lot',
  containers: 'Containers',
  location: 'Location',
  openedAt: 'Opened',
  thawedAt: 'Thawed',
  remaining: 'Remaining',
  quantity: 'Quantity',
  outOfStorageSince: 'Out of cold storage since',
  outOfStorageMinutes: 'Time out of cold storage',
  certificateId: 'Certificate',
  certificateExpiresOn: 'Certificate valid until',
  filename: null, // the certificate's name already stands for certificateId
  sha256: null, // a checksum for the audit trail, not for people
  receivedAt: 'Received',
  manufacturedOn: 'Manufactured',
  expiresOn: "Supplier's expiry date",
  duplicateConfirmed: 'Received again as the same supplier lot',
  duplicateOf: null,
};

/** Fields whose value is a status, in the words of the status chips. */
const STATUS_WORDS: Record<string, string> = { ...LOT_STATUS_WORDS, ...CONTAINER_STATUS_WORDS };

/** Other fields whose value is an internal code (an alert's kind, a material's storage class…), in words. */
const CODE_FIELD_WORDS: Record<string, Readonly<Record<string, string>>> = {
  kind: { ...STATION_KIND_WORDS, ...MATERIAL_KIND_WORDS, ...ALERT_KIND_WORDS },
  severity: ALERT_SEVERITY_WORDS,
  state: ALERT_STATE_WORDS,
  storageClass: STORAGE_CLASS_WORDS,
};
/** Fields naming a type of record ("step_run"): their words ("Step run"). */
const TYPE_FIELDS = new Set(['subjectType', 'entityType']);

function sentenceCase(words: string): string {
  const w = words.trim();
  return w ? w.charAt(0).toUpperCase() + w.slice(1).toLowerCase() : w;
}

export function actionText(action: string): string {
  return ACTION_TEXT[action] ?? sentenceCase(action.replace(/^[a-z]+\./, '').replace(/[-_.]/g, ' '));
}

/** A field name in words: a known label, else its camelCase split ("someField" → "Some field"). */
export function fieldLabel(field: string): string {
  const known = FIELD_LABELS[field];
  if (typeof known === 'string') return known;
  return sentenceCase(field.replace(/([a-z0-9])([A-Z])/g, '$1 $2').replace(/_/g, ' '));
}

export interface ValueContext {
  /** Plant time zone for instants. */
  zone: string;
  /** id → name from the history answer. */
  names?: Readonly<Record<string, string>>;
  /** Field the value belongs to (statuses and durations read differently). */
  field?: string;
}

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A value as short text: instants in plant time, statuses in words, ids by name, null as "—". */
export function valueText(value: unknown, ctx: ValueContext = { zone: 'UTC' }): string {
  if (value === null || value === undefined || value === '') return '—';
  if (ctx.field === 'outOfStorageMinutes' && typeof value === 'number') return formatDuration(value * 60_000);
  if (typeof value === 'string') {
    if (ISO_INSTANT.test(value) && !Number.isNaN(Date.parse(value))) return formatDateTime(value, ctx.zone);
    if (UUID.test(value)) return ctx.names?.[value] ?? 'a record no longer on file';
    const codeWords = ctx.field ? CODE_FIELD_WORDS[ctx.field] : undefined;
    if (codeWords?.[value]) return codeWords[value];
    if (ctx.field && TYPE_FIELDS.has(ctx.field)) return humanize(value);
    if (ctx.field === 'status' || ctx.field === undefined) {
      const status = STATUS_WORDS[value];
      if (status) return status;
    }
    return ctx.field === 'status' ? sentenceCase(value.replace(/_/g, ' ')) : value;
  }
  if (typeof value === 'boolean') return value ? 'Yes' : 'No';
  if (typeof value === 'number') return String(value);
  if (Array.isArray(value)) return String(value.length);
  // A nested record (a UV finish's dose figures …): its fields in words, not its JSON.
  if (isRecord(value)) {
    return Object.entries(value)
      .filter(([k]) => shown(k))
      .map(([k, v]) => `${fieldLabel(k)}: ${valueText(v, { ...ctx, field: k })}`)
      .join('; ');
  }
  return String(value);
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const shown = (field: string) => FIELD_LABELS[field] !== null;

/**
 * The fields that changed between `before` and `after` (old → new), in the order they appear,
 * labelled and in words. A creation (no `before`) lists only `pick` fields of `after`, so a
 * receipt does not spill every column.
 */
export function fieldChanges(
  before: unknown,
  after: unknown,
  ctx: Omit<ValueContext, 'field'> = { zone: 'UTC' },
  pick: readonly string[] = ['status', 'supplierLot', 'containers', 'location'],
): FieldChange[] {
  const b = isRecord(before) ? before : null;
  const a = isRecord(after) ? after : {};
  const text = (field: string, v: unknown) => valueText(v, { ...ctx, field });
  if (!b) {
    return pick.filter((k) => k in a && a[k] !== null).map((k) => ({ field: k, label: fieldLabel(k), from: null, to: text(k, a[k]) }));
  }
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter(shown);
  return keys
    .filter((k) => JSON.stringify(b[k] ?? null) !== JSON.stringify(a[k] ?? null))
    .map((k) => ({ field: k, label: fieldLabel(k), from: text(k, b[k]), to: text(k, a[k]) }));
}
