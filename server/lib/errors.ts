import type { ErrorCode } from '../../shared/errors.js';

/** An expected failure: bad input, missing rights, a missing row, a conflict. Mapped to JSON by the error handler. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const unauthenticated = (message = 'Sign in to continue.') => new AppError(401, 'unauthenticated', message);
export const forbidden = (message = 'Your role does not allow this.') => new AppError(403, 'forbidden', message);
export const notFound = (what: string) => new AppError(404, 'not_found', `${what} was not found.`);
export const conflict = (code: ErrorCode, message: string, details?: unknown) => new AppError(409, code, message, details);
