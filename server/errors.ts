import { messageFor, type ErrorCode } from '#shared/errors.ts';

/** An error with an HTTP status and one of the codes of shared/errors.ts. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message?: string,
    readonly details?: unknown,
  ) {
    super(message ?? messageFor(code));
    this.name = 'HttpError';
  }
}

export const notFound = (code: ErrorCode, message?: string) => new HttpError(404, code, message);
export const badRequest = (code: ErrorCode, message?: string, details?: unknown) => new HttpError(400, code, message, details);
export const conflict = (code: ErrorCode, message?: string) => new HttpError(409, code, message);
