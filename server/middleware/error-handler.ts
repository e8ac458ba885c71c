import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { MulterError } from 'multer';
import { HttpError } from '../lib/http-error';
import type { Logger } from '../lib/logger';
import type { ApiErrorBody } from '../../shared/contracts/errors';

/** Turns zod issues into { field: [messages] } keyed like the form fields (nested paths joined by dots). */
export function fieldErrorsFrom(err: ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of err.issues) {
    const key = issue.path.length ? issue.path.map(String).join('.') : '_form';
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', '57P01', '57P02', '57P03', '08006', '08001', '08003', '08004']);

function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { code?: string; message?: string; cause?: { code?: string; message?: string } } | undefined;
  const codes = [e?.code, e?.cause?.code];
  if (codes.some((c) => c && CONNECTION_CODES.has(c))) return true;
  const msg = `${e?.message ?? ''} ${e?.cause?.message ?? ''}`;
  return /Connection terminated|timeout exceeded when trying to connect|connect ECONNREFUSED|Client has encountered a connection error/i.test(msg);
}

function pgCode(err: unknown): string | undefined {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.cause?.code ?? e?.code;
}

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const requestId = String(res.locals.requestId ?? '');
    const send = (status: number, body: ApiErrorBody, headers?: Record<string, string>) => {
      if (res.headersSent) return res.end();
      if (headers) res.set(headers);
      res.status(status).json({ error: { ...body.error, requestId } });
    };
    if (err instanceof ZodError) {
      logger.info({ requestId, event: 'input_validation_fail', path: req.path }, 'validation failed');
      return send(400, { error: { code: 'validation_failed', message: 'Some fields need attention.', fieldErrors: fieldErrorsFrom(err) } });
    }
    if (err instanceof HttpError) {
      if (err.status === 403) logger.warn({ requestId, event: 'authz_fail', path: req.path, method: req.method }, err.message);
      return send(err.status, { error: { code: err.code, message: err.message, fieldErrors: err.fieldErrors } }, err.headers);
    }
    if (err instanceof MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') return send(413, { error: { code: 'payload_too_large', message: 'That file is too large.' } });
      return send(400, { error: { code: 'validation_failed', message: err.code === 'LIMIT_FILE_COUNT' || err.code === 'LIMIT_UNEXPECTED_FILE' ? 'Too many files, or a file in the wrong field.' : 'The upload was not valid.' } });
    }
    const status = (err as { status?: number; type?: string }).status;
    if ((err as { type?: string }).type === 'entity.parse.failed') {
      return send(400, { error: { code: 'validation_failed', message: 'The request body is not valid JSON.' } });
    }
    if ((err as { type?: string }).type === 'entity.too.large' || status === 413) {
      return send(413, { error: { code: 'payload_too_large', message: 'The request is too large.' } });
    }
    if (pgCode(err) === '23505') {
      return send(409, { error: { code: 'conflict', message: 'That already exists.' } });
    }
    if (pgCode(err) === '22P02' || pgCode(err) === '22003' || pgCode(err) === '22007' || pgCode(err) === '22008') {
      return send(400, { error: { code: 'validation_failed', message: 'A value in the request is not valid.' } });
    }
    if (isDatabaseUnavailable(err)) {
      logger.error({ requestId, event: 'db_unavailable', err: (err as Error).message }, 'database unavailable');
      return send(503, { error: { code: 'unavailable', message: 'The records database is not reachable right now. Try again in a moment.' } }, { 'Retry-After': '5' });
    }
    logger.error({ requestId, event: 'unexpected_error', path: req.path, err: { message: (err as Error)?.message, stack: (err as Error)?.stack } }, 'unexpected error');
    return send(500, { error: { code: 'internal', message: 'Something went wrong on our side. The problem was logged; please try again.' } });
  };
}

export const apiNotFound: RequestHandler = (_req, _res, next) => {
  next(new HttpError(404, 'not_found', 'There is no such API route.'));
};
