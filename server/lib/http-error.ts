import type { ErrorCode } from '../../shared/contracts/errors';

/** The one error type services throw; only the error handler turns it into a response. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fieldErrors?: Record<string, string[]>,
    readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export const notFound = (what = 'That record') => new HttpError(404, 'not_found', `${what} does not exist.`);
export const forbidden = (message = 'Your role may not do that.') => new HttpError(403, 'forbidden', message);
export const conflict = (message: string, fieldErrors?: Record<string, string[]>) =>
  new HttpError(409, 'conflict', message, fieldErrors);
export const badRequest = (message: string, fieldErrors?: Record<string, string[]>) =>
  new HttpError(400, 'validation_failed', message, fieldErrors);
