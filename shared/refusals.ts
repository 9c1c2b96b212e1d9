/**
 * The one catalogue of error and refusal codes: each code's HTTP status and a plain title a
 * person reads ("Lot on hold"). The server throws from it (`conflict('LOT_ON_HOLD', …)`, which
 * takes the status from here), the client matches on it and shows the title with the server's
 * message, never the code. Codes stay in the JSON for scripts. A code used anywhere in server/
 * or src/ must be listed here (tests/unit/refusals.test.ts scans the source).
 */
export const REFUSALS = {
  // Input and transport
  VALIDATION_FAILED: { status: 400, title: 'Input not accepted' },
  BAD_REQUEST: { status: 400, title: 'Request not understood' },
  MALFORMED_JSON: { status: 400, title: 'Request not understood' },
  BAD_UPLOAD: { status: 400, title: 'Upload not accepted' },
  FILE_MISSING: { status: 404, title: 'Document file missing' },
  TOO_LARGE: { status: 413, title: 'File too large' },
  NOT_SIGNED_IN: { status: 401, title: 'Sign in to continue' },
  BAD_CREDENTIALS: { status: 401, title: 'E-mail or password not recognised' },
  FORBIDDEN: { status: 403, title: 'Not allowed for your role' },
  NOT_FOUND: { status: 404, title: 'Not found' },
  TOO_MANY_ATTEMPTS: { status: 429, title: 'Too many attempts' },
  IDEMPOTENCY_IN_PROGRESS: { status: 409, title: 'Already being processed' },
  IDEMPOTENCY_KEY_REUSED: { status: 422, title: 'Request key already used for another request' },
  UNSUPPORTED_MEDIA_TYPE: { status: 415, title: 'Send the request body as JSON' },
  CROSS_SITE_REQUEST: { status: 403, title: 'Change sent from a page outside Tacklog' },
  TRY_AGAIN: { status: 409, title: 'Another change happened at the same moment; send again' },
  REFERENCE_CHANGED: { status: 409, title: 'A record this refers to changed; reload' },
  DUPLICATE_EMAIL: { status: 409, title: 'A user with this e-mail already exists' },
  PASSWORD_CHANGE_REQUIRED: { status: 403, title: 'Choose your own password first' },
  RESET_LINK_INVALID: { status: 400, title: 'Reset link not valid' },
  ALREADY_LOADED: { status: 409, title: 'Already loaded for this batch at this station' },
  INTERNAL: { status: 500, title: 'Something went wrong' },
  DB_UNAVAILABLE: { status: 503, title: 'Database unreachable, retrying' },

  // Catalogue
  DUPLICATE: { status: 409, title: 'Already exists' },
  DUPLICATE_CODE: { status: 409, title: 'Code already in use' },
  DUPLICATE_NAME: { status: 409, title: 'Name already in use' },
  DUPLICATE_GTIN: { status: 409, title: 'GTIN already in use' },
  DUPLICATE_SUPPLIER: { status: 409, title: 'Supplier already exists' },
  DUPLICATE_LOT: { status: 409, title: 'Supplier lot already received' },
  MATERIAL_RETIRED: { status: 409, title: 'Material retired' },
  SUPPLIER_RETIRED: { status: 409, title: 'Supplier retired' },
  STATION_RETIRED: { status: 409, title: 'Station retired' },
  MODEL_RETIRED: { status: 409, title: 'Driver model retired' },
  MODEL_IN_USE: { status: 409, title: 'Recipe in use' },
  MODEL_HAS_NO_STEPS: { status: 409, title: 'Recipe has no steps' },
  MODEL_NOT_CURRENT: { status: 409, title: 'Not the current recipe revision' },
  REVISION_DRAFT_EXISTS: { status: 409, title: 'A draft revision already exists' },

  // Lots and containers
  LOT_ON_HOLD: { status: 409, title: 'Lot on hold' },
  LOT_QUARANTINED: { status: 409, title: 'Lot quarantined' },
  LOT_REJECTED: { status: 409, title: 'Lot rejected' },
  LOT_USED_UP: { status: 409, title: 'Lot used up' },
  INVALID_TRANSITION: { status: 409, title: 'Status change not allowed' },
  EXPIRED: { status: 409, title: 'Expired' },
  OPEN_LIFE_EXCEEDED: { status: 409, title: 'Past its life after opening' },
  CONTAINER_EMPTY: { status: 409, title: 'Container empty' },
  CONTAINER_SCRAPPED: { status: 409, title: 'Container scrapped' },
  ALREADY_SCRAPPED: { status: 409, title: 'Already scrapped' },
  ALREADY_THAWED: { status: 409, title: 'Already thawed' },
  NOT_FROZEN: { status: 409, title: 'Not frozen material' },
  NOT_THAWED: { status: 409, title: 'Not thawed yet' },
  NOT_REFRIGERATED: { status: 409, title: 'Not refrigerated material' },
  ALREADY_OUT_OF_STORAGE: { status: 409, title: 'Already out of storage' },
  NOT_OUT_OF_STORAGE: { status: 409, title: 'Not out of storage' },
  INSUFFICIENT_STOCK: { status: 409, title: 'Not enough stock' },

  // Stations, mixes, steps
  WRONG_MATERIAL: { status: 409, title: 'Wrong material for this step' },
  WRONG_STATION: { status: 409, title: 'Wrong station' },
  WRONG_BATCH: { status: 409, title: 'Wrong batch' },
  MATERIAL_NOT_LOADED: { status: 409, title: 'Material not loaded' },
  POT_LIFE_EXCEEDED: { status: 409, title: 'Pot life exceeded' },
  POT_LIFE_UNKNOWN: { status: 409, title: 'Pot life not set' },
  NOT_MIX_PARTNERS: { status: 409, title: 'Not mix partners' },
  PARTNER_TAKEN: { status: 409, title: 'Partner already in a mix' },
  PARTNER_STILL_NEEDED: { status: 409, title: 'Partner still needed' },
  MIX_DISCARDED: { status: 409, title: 'Mix discarded' },
  CURE_INCOMPLETE: { status: 409, title: 'Cure not complete' },
  UV_DOSE_LOW: { status: 409, title: 'UV dose too low' },
  STEP_NOT_STARTED: { status: 409, title: 'Step not started' },
  STEP_ALREADY_STARTED: { status: 409, title: 'Step already started' },
  STEP_ALREADY_DONE: { status: 409, title: 'Step already done' },
  STEP_OUT_OF_ORDER: { status: 409, title: 'Step out of order' },
  STEPS_INCOMPLETE: { status: 409, title: 'Steps not finished' },
  BATCH_CLOSED: { status: 409, title: 'Batch closed' },
  CLOCK_BEHIND: { status: 409, title: 'Time earlier than the last record' },

  // Drivers, tests, rework
  DRIVER_SCRAPPED: { status: 409, title: 'Driver scrapped' },
  NOT_FOR_REWORK: { status: 409, title: 'Driver not waiting for rework' },
  NOT_REWORKABLE: { status: 409, title: 'Driver cannot be reworked' },
  REWORK_IN_PROGRESS: { status: 409, title: 'Rework in progress' },

  // Exports
  EXPORT_TOO_LARGE: { status: 409, title: 'Too many rows for one export' },

  // Users
  CANNOT_DEACTIVATE_SELF: { status: 409, title: 'You cannot deactivate your own account' },
  LAST_ADMIN: { status: 409, title: 'The last administrator must stay' },
  USER_DEACTIVATED: { status: 409, title: 'User deactivated' },

  // Alerts
  ALERT_ACKNOWLEDGED: { status: 409, title: 'Alert already acknowledged' },
  ALERT_RESOLVED: { status: 409, title: 'Alert already resolved' },

  // Said by the client itself, with no answer from the server (status 0) or an unreadable one.
  NETWORK: { status: 0, title: 'Server not reachable' },
  BAD_RESPONSE: { status: 0, title: 'Unexpected answer from the server' },
  HTTP_ERROR: { status: 0, title: 'Request refused' },
  CLIENT_ERROR: { status: 0, title: 'Could not be sent' },
  OFFLINE: { status: 0, title: 'Offline' },
  UNKNOWN_BATCH: { status: 0, title: 'Not a build batch' },
  NO_STATION: { status: 0, title: 'Scan the station first' },
} as const satisfies Record<string, { status: number; title: string }>;

export type RefusalCode = keyof typeof REFUSALS;

export function isRefusalCode(code: string): code is RefusalCode {
  return Object.prototype.hasOwnProperty.call(REFUSALS, code);
}

/** The plain title of a code; an unknown code reads as a general refusal, never as the code. */
export function refusalTitle(code: string | null | undefined): string {
  return code && isRefusalCode(code) ? REFUSALS[code].title : 'Not accepted';
}

/** The HTTP status the catalogue gives a code. */
export function refusalStatus(code: RefusalCode): number {
  return REFUSALS[code].status;
}

/**
 * What a person reads for a refusal: the plain title, then the server's message ("Lot on hold.
 * Lot L-77 is on hold awaiting incoming inspection …"). The code itself is never shown.
 */
export function refusalText(code: string | null | undefined, message?: string | null): string {
  const title = refusalTitle(code);
  const detail = (message ?? '').trim();
  if (!detail) return `${title}.`;
  return detail.toLowerCase().startsWith(title.toLowerCase()) ? detail : `${title}. ${detail}`;
}
