import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { Logger } from '../lib/logger';

/** Gives each request an id (echoed in X-Request-Id) and one JSON log line when it finishes. */
export function requestContext(logger: Logger): RequestHandler {
  return (req, res, next) => {
    const requestId = randomUUID();
    res.locals.requestId = requestId;
    res.setHeader('X-Request-Id', requestId);
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      logger.info({ requestId, method: req.method, path: req.path, status: res.statusCode, ms: Math.round(ms * 10) / 10, userId: res.locals.actor?.userId }, 'request');
    });
    next();
  };
}
