import type { FieldIssue } from '../shared/schemas/common';

/**
 * The one error type business code throws. The error handler maps it to the API's
 * error shape: {error: {code, message, details}} with `status`.
 */
export class AppError extends Error {
  constructor(
    public readonly code: string,
    message: string,
    public readonly status: number = 400,
    public readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, details?: FieldIssue[]) =>
  new AppError('VALIDATION_FAILED', message, 400, details);

/** A 400 naming one field. */
export const fieldError = (field: string, message: string) =>
  new AppError('VALIDATION_FAILED', `${field} ${message}`, 400, [{ field, message }]);

export const notSignedIn = () => new AppError('NOT_SIGNED_IN', 'Sign in to continue.', 401);

export const forbidden = (message = 'Your role does not allow this.') => new AppError('FORBIDDEN', message, 403);

export const notFound = (what: string) => new AppError('NOT_FOUND', `${what} was not found.`, 404);

/** A plant rule refuses the request (wrong material, on hold, expired, cure incomplete, duplicate…). */
export const conflict = (code: string, message: string, details?: unknown) => new AppError(code, message, 409, details);
