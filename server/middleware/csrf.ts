import type { RequestHandler } from 'express';
import { timingSafeEqual } from 'node:crypto';
import { HttpError } from '../lib/http-error';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a), y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * CSRF defence for cookie sessions: a session token echoed in X-CSRF-Token on every state-changing
 * request (uploads too), Fetch Metadata / Origin checks, and no "simple" content types on JSON routes.
 */
export function csrfProtection(allowedOrigins: string[]): RequestHandler {
  return (req, res, next) => {
    res.vary('Sec-Fetch-Site');
    res.vary('Origin');
    if (SAFE.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    if (site && site !== 'same-origin' && site !== 'none') {
      return next(new HttpError(403, 'forbidden', 'Cross-site requests are refused.'));
    }
    const origin = req.get('origin');
    if (!site && origin) {
      const own = `${req.protocol}://${req.get('host')}`;
      if (origin !== own && !allowedOrigins.includes(origin)) return next(new HttpError(403, 'forbidden', 'Requests from another site are refused.'));
    }
    const hasBody = Number(req.get('content-length') ?? 0) > 0 || req.get('transfer-encoding') !== undefined;
    if (hasBody && !req.is(['application/json', 'multipart/form-data'])) {
      return next(new HttpError(415, 'unsupported_media_type', 'Send JSON (application/json) or a file upload (multipart/form-data).'));
    }
    const expected = req.session?.csrfToken;
    const sent = req.get('x-csrf-token');
    if (!expected || !sent || !sameToken(expected, sent)) {
      return next(new HttpError(403, 'forbidden', 'Your page is out of date. Reload it and try again.'));
    }
    next();
  };
}
