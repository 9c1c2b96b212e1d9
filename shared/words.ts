/**
 * Plain words for the internal values people would otherwise read: roles, material kinds,
 * station kinds, storage classes, statuses of lots, containers, mixes, batches and drivers,
 * alert kinds, severities and states. Pages, components, server messages and labels say
 * `materialKindWords('dust_cap')` ("Dust cap"), never the value itself. Colours and icons stay
 * with the client (src/components/common/statusText.ts, src/components/alerts/alertLook.ts);
 * the words live here so that both sides say the same thing.
 */
import type {
  AlertKind,
  AlertSeverity,
  AlertState,
  AttachmentKind,
  BatchStatus,
  ContainerStatus,
  DriverStatus,
  LotStatus,
  MaterialKind,
  MixStatus,
  Role,
  StepRunKind,
  StorageClass,
  TestResult,
} from './constants';

/** Any snake_case or kebab-case value as words: 'lead_termination' → 'Lead termination'. */
export function humanize(value: string | null | undefined): string {
  if (!value) return '';
  const words = value.replace(/[_]+/g, ' ').replace(/\s+/g, ' ').trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

function lookup<K extends string>(table: Record<K, string>) {
  return (value: string | null | undefined): string => {
    if (!value) return '';
    return (table as Record<string, string>)[value] ?? humanize(value);
  };
}

export const ROLE_WORDS: Record<Role, string> = {
  admin: 'Administrator',
  receiving: 'Receiving',
  assembler: 'Assembler',
  quality: 'Quality',
  purchasing: 'Purchasing',
};
export const roleWord = lookup(ROLE_WORDS);
/** A list of roles in words: 'Quality or Administrator'. */
export function roleWords(roles: readonly string[]): string {
  const words = roles.map(roleWord);
  if (words.length <= 1) return words.join('');
  return `${words.slice(0, -1).join(', ')} or ${words[words.length - 1]}`;
}

export const MATERIAL_KIND_WORDS: Record<MaterialKind, string> = {
  adhesive: 'Adhesive',
  activator: 'Activator',
  hardener: 'Hardener',
  wire: 'Wire',
  magnet: 'Magnet',
  cone: 'Cone',
  spider: 'Spider',
  dust_cap: 'Dust cap',
  frame: 'Frame',
  other: 'Other',
};
export const materialKindWords = lookup(MATERIAL_KIND_WORDS);

/**
 * Station kinds are free text chosen by the administrator; recipe steps name the kind they run
 * at. The demo plant's kinds have fixed words; any other kind reads as its words.
 */
export const STATION_KIND_WORDS: Record<string, string> = {
  moving_parts: 'Moving parts',
  magnet_assembly: 'Magnet assembly',
  lead_termination: 'Lead termination',
  dust_cap: 'Dust cap',
  magnetize_test: 'Magnetize and test',
  cure_oven: 'Cure oven',
  uv_cure: 'UV cure',
};
export const stationKindWords = lookup(STATION_KIND_WORDS);

export const STORAGE_CLASS_WORDS: Record<StorageClass, string> = {
  ambient: 'Ambient',
  refrigerated: 'Refrigerated',
  frozen: 'Frozen',
};
export const storageClassWords = lookup(STORAGE_CLASS_WORDS);

export const LOT_STATUS_WORDS: Record<LotStatus, string> = {
  on_hold: 'On hold',
  released: 'Released',
  quarantined: 'Quarantined',
  rejected: 'Rejected',
  used_up: 'Used up',
};
export const lotStatusWords = lookup(LOT_STATUS_WORDS);

export const CONTAINER_STATUS_WORDS: Record<ContainerStatus, string> = {
  sealed: 'Sealed',
  open: 'Open',
  empty: 'Empty',
  scrapped: 'Scrapped',
};
export const containerStatusWords = lookup(CONTAINER_STATUS_WORDS);

export const MIX_STATUS_WORDS: Record<MixStatus, string> = {
  active: 'In use',
  used_up: 'Used up',
  discarded: 'Discarded',
};
export const mixStatusWords = lookup(MIX_STATUS_WORDS);

export const BATCH_STATUS_WORDS: Record<BatchStatus, string> = {
  open: 'Open',
  in_process: 'In process',
  completed: 'Completed',
  cancelled: 'Cancelled',
};
export const batchStatusWords = lookup(BATCH_STATUS_WORDS);

export const DRIVER_STATUS_WORDS: Record<DriverStatus, string> = {
  in_process: 'In process',
  passed: 'Passed',
  failed: 'Failed',
  reworked: 'Reworked',
  scrapped: 'Scrapped',
};
export const driverStatusWords = lookup(DRIVER_STATUS_WORDS);

export const TEST_RESULT_WORDS: Record<TestResult, string> = { pass: 'Pass', fail: 'Fail' };
export const testResultWords = lookup(TEST_RESULT_WORDS);

export const STEP_RUN_KIND_WORDS: Record<StepRunKind, string> = { build: 'Build', rework: 'Rework' };
export const stepRunKindWords = lookup(STEP_RUN_KIND_WORDS);

/** The part of a two-part adhesive a container gave to a mix. */
export const MIX_PART_WORDS: Record<'resin' | 'hardener', string> = { resin: 'Resin', hardener: 'Hardener' };
export const mixPartWords = lookup(MIX_PART_WORDS);

export const ATTACHMENT_KIND_WORDS: Record<AttachmentKind, string> = {
  certificate: 'Certificate of analysis',
  sds: 'Safety data sheet',
  other: 'Document',
};
export const attachmentKindWords = lookup(ATTACHMENT_KIND_WORDS);

export const ALERT_KIND_WORDS: Record<AlertKind, string> = {
  pot_life_exceeded: 'Pot life passed',
  short_cure: 'Next step before cure was complete',
  expired_in_stock: 'Expired material in stock',
  expiring_soon: 'Lot expiring soon',
  quarantine_advised: 'Quarantine advised',
  below_reorder_point: 'Below reorder point',
  audit_chain_broken: 'Audit trail does not verify',
  lamp_check_due: 'UV lamp radiometer check due',
  humidity_out_of_window: 'Cured outside its humidity range',
};
export const alertKindWords = lookup(ALERT_KIND_WORDS);

export const ALERT_SEVERITY_WORDS: Record<AlertSeverity, string> = {
  critical: 'Critical',
  warning: 'Warning',
  info: 'Notice',
};
export const alertSeverityWords = lookup(ALERT_SEVERITY_WORDS);

export const ALERT_STATE_WORDS: Record<AlertState, string> = {
  open: 'Open',
  acknowledged: 'Acknowledged',
  resolved: 'Resolved',
};
export const alertStateWords = lookup(ALERT_STATE_WORDS);

/** Why an expiry is what it is, in words (causes from shared/expiry.ts). */
export const EXPIRY_CAUSE_TEXT: Record<string, string> = {
  supplier_expiry: "supplier's expiry date",
  shelf_life: 'shelf life',
  open_life: 'after-opening life',
  thawed_life: 'life after thawing',
  out_of_storage: 'time out of cold storage',
  pot_life: 'pot life',
};

export function expiryCauseText(cause: string | null | undefined): string {
  if (!cause) return '';
  return EXPIRY_CAUSE_TEXT[cause] ?? cause.replace(/_/g, ' ');
}

/** How a reading's source reads: typed in on the page, or the name a logger or script gave it. */
export function readingSourceWords(source: string): string {
  return source === 'manual' ? 'Entered by hand' : source;
}

/** How an adhesive cures (shared/cure-methods.ts), as the traveler and the material form say it. */
export const CURE_METHOD_WORDS: Record<'ambient' | 'heat' | 'uv', string> = {
  ambient: 'Room-temperature cure',
  heat: 'Oven (heat) cure',
  uv: 'UV-light cure (by dose)',
};
export const cureMethodWords = lookup(CURE_METHOD_WORDS);
