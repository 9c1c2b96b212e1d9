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
export function sendError(res: Response, code: RefusalCode, message: string, details?: unknown, status: number = REFUSALS[code].status): void {
  if (status === 503) res.set('Retry-After', String(DB_RETRY_AFTER_SECONDS));
  res.status(status).json({ error: { code, message, details } });
}

/** 503 DB_UNAVAILABLE: the request could not reach PostgreSQL (down, restarting, refusing connections). */
export function databaseUnavailable(): AppError {
  return new AppError('DB_UNAVAILABLE', 'The database cannot be reached right now; Tacklog retries by itself. Try again in a few seconds.', 503);
}

/**
 * The single error handler: AppError → its status; body-parser and upload errors → 4xx; the
 * database unreachable → 503 DB_UNAVAILABLE with Retry-After; the rest → 500.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) {
    next(err);
    return;
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
    res.set('Retry-After', String(DB_RETRY_AFTER_SECONDS));
    res.status(503).json({ error: { code: e503.code, message: e503.message } });
    return;
  }
  console.error(`[error] ${req.method} ${req.originalUrl}:`, err);
  sendError(res, 'INTERNAL', 'Something went wrong on the server; it has been logged.');
};
