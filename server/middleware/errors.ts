import type { ErrorRequestHandler, RequestHandler, Response } from 'express';
import type { z } from 'zod';
import type { FieldIssue } from '../../shared/schemas/common';
import { AppError } from '../errors';
import { REFUSALS, type RefusalCode } from '../../shared/refusals';
import { DB_RETRY_AFTER_SECONDS, isDatabaseUnavailable, noteDatabaseDown } from '../db/availability';

/** zod issues as the API's `details`: [{field: 'containers', message: '...'}]. */
export function zodIssues(error: z.ZodError, prefix = ''): FieldIssue[] {
  return error.issues.map((issue) => ({
    field: `${prefix}${issue.path.map(String).join('.')}`.replace(/\.$/, ''),
    message: issue.message,
  }));
}

export const notFoundApi: RequestHandler = (req, _res, next) => {
  next(new AppError('NOT_FOUND', `No API route ${req.method} ${req.path}.`, 404));
};

interface HttpishError {
  type?: string;
  status?: number;
  statusCode?: number;
  code?: string;
  field?: string;
}

/** Sends the API's error shape with a code of the catalogue (and its status unless given). */
export function sendError(
  res: Response,
  code: RefusalCode,
  message: string,
  details?: unknown,
  status: number = REFUSALS[code].status,
): void {
  if (status === 503) res.set('Retry-After', String(DB_RETRY_AFTER_SECONDS));
  res.status(status).json({ error: { code, message, details } });
}

/** 503 DB_UNAVAILABLE: the request could not reach PostgreSQL (down, restarting, refusing connections). */
export function databaseUnavailable(): AppError {
  return new AppError(
    'DB_UNAVAILABLE',
    'The database cannot be reached right now; Tacklog retries by itself. Try again in a few seconds.',
    503,
  );
}

interface PgError {
  code: string;
  constraint?: string;
  detail?: string;
  column?: string;
  table?: string;
}

/** The PostgreSQL error in `err` or its causes (Drizzle wraps the driver's error). */
function pgErrorOf(err: unknown): PgError | null {
  for (
    let e = err as { code?: unknown; cause?: unknown; severity?: unknown } | undefined, i = 0;
    e && i < 5;
    e = e.cause as typeof e, i++
  ) {
    if (typeof e.code === 'string' && /^[0-9A-Z]{5}$/.test(e.code) && 'severity' in e) return e as unknown as PgError;
  }
  return null;
}

const camel = (column: string) => column.replace(/_([a-z0-9])/g, (_m, c: string) => c.toUpperCase());

/**
 * Unique constraints whose refusal reads better with its own code and words. Any other unique
 * violation is 409 DUPLICATE naming the fields from PostgreSQL's detail ("Key (code)=…").
 */
const UNIQUE_CONSTRAINTS: Record<string, { code: RefusalCode; fields: string[]; message: string }> = {
  materials_code_uq: {
    code: 'DUPLICATE_CODE',
    fields: ['code'],
    message: 'A material with this code already exists; choose another code.',
  },
  materials_gtin_uq: {
    code: 'DUPLICATE_GTIN',
    fields: ['gtin'],
    message: 'This GTIN already belongs to another material; one GTIN identifies one material.',
  },
  suppliers_code_uq: {
    code: 'DUPLICATE_CODE',
    fields: ['code'],
    message: 'A supplier with this code already exists; choose another code.',
  },
  suppliers_name_lower_uq: { code: 'DUPLICATE_NAME', fields: ['name'], message: 'A supplier with this name already exists.' },
  stations_code_uq: { code: 'DUPLICATE_CODE', fields: ['code'], message: 'A station with this code already exists; choose another code.' },
  driver_models_code_revision_uq: {
    code: 'DUPLICATE_CODE',
    fields: ['code'],
    message: 'A driver model with this code already exists; choose another code.',
  },
  users_email_lower_uq: { code: 'DUPLICATE_EMAIL', fields: ['email'], message: 'A user with this e-mail address already exists.' },
  defect_codes_pkey: { code: 'DUPLICATE', fields: ['code'], message: 'This defect code already exists; edit it instead.' },
  station_loads_active_mix_uq: {
    code: 'ALREADY_LOADED',
    fields: ['mixCode'],
    message: 'This mix was loaded for this batch at this station a moment ago; it is loaded once.',
  },
  station_loads_active_container_uq: {
    code: 'ALREADY_LOADED',
    fields: ['containerCode'],
    message: 'This container was loaded for this batch at this station a moment ago; it is loaded once.',
  },
};

/** Fields named in a unique violation's detail: `Key (lower(name))=(x) already exists.` → ['name']. */
function fieldsFromDetail(detail: string | undefined): string[] {
  const m = /^Key \((.+?)\)=/.exec(detail ?? '');
  if (!m) return [];
  return m[1].split(',').map((part) =>
    camel(
      part
        .trim()
        .replace(/^\w+\((.+)\)$/, '$1')
        .replace(/::\w+$/, ''),
    ),
  );
}

/** Maps a PostgreSQL error caused by the request's data to an answer; null for a server fault. */
export function appErrorFromPg(err: unknown): AppError | null {
  const pg = pgErrorOf(err);
  if (!pg) return null;
  if (pg.code === '23505') {
    const known = pg.constraint ? UNIQUE_CONSTRAINTS[pg.constraint] : undefined;
    const fields = known?.fields ?? fieldsFromDetail(pg.detail);
    const details = fields.map((field) => ({ field, message: 'is already used' }));
    return new AppError(
      known?.code ?? 'DUPLICATE',
      known?.message ?? (fields.length ? `${fields.join(', ')} is already used; choose another.` : 'This already exists.'),
      409,
      details,
    );
  }
  if (pg.code === '40001' || pg.code === '40P01') {
    return new AppError('TRY_AGAIN', 'Another change to the same records happened at the same moment; send the request again.', 409);
  }
  if (pg.code === '23503') {
    return new AppError(
      'REFERENCE_CHANGED',
      'A record this request refers to was changed or removed a moment ago; reload and try again.',
      409,
    );
  }
  // Data exceptions (class 22) and check violations come from values the schemas let through.
  if (pg.code.startsWith('22') || pg.code === '23514' || pg.code === '23502') {
    const field = pg.column ? camel(pg.column) : undefined;
    return new AppError(
      'VALIDATION_FAILED',
      field ? `${field} has a value that cannot be stored.` : 'A value in the request cannot be stored (out of range or not allowed).',
      400,
      field ? [{ field, message: 'cannot be stored' }] : undefined,
    );
  }
  return null;
}

/**
 * The single error handler: AppError → its status; database refusals caused by the request's
 * data → 409/400 naming the field; body-parser and upload errors → 4xx; the database
 * unreachable → 503 DB_UNAVAILABLE with Retry-After; the rest → 500.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) {
    next(err);
    return;
  }
  const fromPg = err instanceof AppError ? null : appErrorFromPg(err);
  if (fromPg) {
    // The schemas should have caught a value the database refuses: log it to tighten them.
    if (fromPg.code === 'VALIDATION_FAILED') req.log.warn({ err }, `${req.method} ${req.originalUrl}: the database refused a value`);
    err = fromPg;
  }
  if (err instanceof AppError) {
    sendError(res, err.code, err.message, err.details, err.status);
    return;
  }
  const e = err as HttpishError;
  if (e.type === 'entity.parse.failed') {
    sendError(res, 'MALFORMED_JSON', 'The request body is not valid JSON.');
    return;
  }
  if (e.type === 'entity.too.large' || e.code === 'LIMIT_FILE_SIZE') {
    sendError(res, 'TOO_LARGE', 'The upload is larger than allowed.', e.field ? [{ field: e.field, message: 'is too large' }] : undefined);
    return;
  }
  if (typeof e.code === 'string' && e.code.startsWith('LIMIT_')) {
    sendError(res, 'BAD_UPLOAD', `The upload was refused (${e.code}).`, e.field ? [{ field: e.field, message: 'was refused' }] : undefined);
    return;
  }
  const status = e.status ?? e.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    sendError(res, 'BAD_REQUEST', 'The request could not be read.', undefined, status);
    return;
  }
  if (isDatabaseUnavailable(err)) {
    noteDatabaseDown(err);
    const e503 = databaseUnavailable();
    sendError(res, 'DB_UNAVAILABLE', e503.message);
    return;
  }
  // req.log (server/logger.ts) carries the request id; the response names the same id (X-Request-Id).
  req.log.error({ err }, `${req.method} ${req.originalUrl} failed`);
  sendError(res, 'INTERNAL', 'Something went wrong on the server; it has been logged.');
};
