import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { z } from 'zod';
import type { FieldIssue } from '../../shared/schemas/common';
import { AppError } from '../errors';

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

/** The single error handler: AppError → its status; body-parser and upload errors → 4xx; the rest → 500. */
export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) {
    next(err);
    return;
  }
  if (err instanceof AppError) {
    res.status(err.status).json({ error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  const e = err as HttpishError;
  if (e.type === 'entity.parse.failed') {
    res.status(400).json({ error: { code: 'MALFORMED_JSON', message: 'The request body is not valid JSON.' } });
    return;
  }
  if (e.type === 'entity.too.large' || e.code === 'LIMIT_FILE_SIZE') {
    res.status(413).json({
      error: { code: 'TOO_LARGE', message: 'The upload is larger than allowed.', details: e.field ? [{ field: e.field, message: 'is too large' }] : undefined },
    });
    return;
  }
  if (typeof e.code === 'string' && e.code.startsWith('LIMIT_')) {
    res.status(400).json({ error: { code: 'BAD_UPLOAD', message: `The upload was refused (${e.code}).`, details: e.field ? [{ field: e.field, message: 'was refused' }] : undefined } });
    return;
  }
  const status = e.status ?? e.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    res.status(status).json({ error: { code: 'BAD_REQUEST', message: 'The request could not be read.' } });
    return;
  }
  // pino-http's child logger carries the request id; the response names the same id (X-Request-Id).
  req.log.error({ err }, `${req.method} ${req.originalUrl} failed`);
  res.status(500).json({ error: { code: 'INTERNAL', message: 'Something went wrong on the server; it has been logged.' } });
};
