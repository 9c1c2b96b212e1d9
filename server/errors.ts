import type { FieldIssue } from '../shared/schemas/common';
import { REFUSALS, type RefusalCode } from '../shared/refusals';

/**
 * The one error type business code throws. The error handler maps it to the API's
 * error shape: {error: {code, message, details}} with `status`. The code comes from the one
 * catalogue (`shared/refusals.ts`), and so does the status unless one is given.
 */
export class AppError extends Error {
  public readonly status: number;

  constructor(
    public readonly code: RefusalCode,
    message: string,
    status?: number,
    public readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
    this.status = status ?? REFUSALS[code].status;
  }
}

export const badRequest = (message: string, details?: FieldIssue[]) => new AppError('VALIDATION_FAILED', message, 400, details);

/** A 400 naming one field. */
export const fieldError = (field: string, message: string) =>
  new AppError('VALIDATION_FAILED', `${field} ${message}`, 400, [{ field, message }]);

export const notSignedIn = () => new AppError('NOT_SIGNED_IN', 'Sign in to continue.', 401);

export const forbidden = (message = 'Your role does not allow this.') => new AppError('FORBIDDEN', message, 403);

export const notFound = (what: string) => new AppError('NOT_FOUND', `${what} was not found.`, 404);

/**
 * A plant rule refuses the request (wrong material, on hold, expired, cure incomplete,
 * duplicate…): the code's status comes from the catalogue (409 for plant rules).
 */
export const conflict = (code: RefusalCode, message: string, details?: unknown) =>
  new AppError(code, message, REFUSALS[code].status, details);
