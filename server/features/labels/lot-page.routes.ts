import crypto from 'node:crypto';
import { Router, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { PUBLIC_CODE_PATTERN } from '../../../shared/domain/lot-page-url';
import { LOT_PAGE_CSP, loadLotPage, renderLotNotFound, renderLotPage, renderLotTooMany } from './lot-page';

/**
 * Rendered pages (and not-found answers) are reused for 5 s with no database work, so a burst of scans stays
 * cheap. A recall or a batch state change empties the cache of this process at once (see forgetCachedLotPages);
 * browsers may keep a page for 10 s.
 */
const CACHE_MS = 5_000;
const CACHE_MAX = 2_000;
const liveCaches = new Set<Map<string, unknown>>();

/** Called after a recall opens or closes, or a batch changes state, so the next scan shows it. */
export function forgetCachedLotPages(): void {
  for (const cache of liveCaches) cache.clear();
}

/**
 * GET /lot/:publicCode: the page a label's QR opens. No sign-in, no JavaScript, only public fields.
 * A short public cache (10 s) so a recall shows quickly; noindex; generous per-address rate limit.
 */
export function lotPageRouter({ db, now, config }: AppDeps) {
  const cache = new Map<string, CachedPage>();
  liveCaches.add(cache);
  // Mounted before helmet and request logging (server/app.ts), so the headers a public page needs are set here.
  const headers: Record<string, string> = {
    'Content-Security-Policy': LOT_PAGE_CSP,
    'X-Robots-Tag': 'noindex, nofollow',
    'Cache-Control': 'public, max-age=10',
    'Referrer-Policy': 'no-referrer',
    'X-Content-Type-Options': 'nosniff',
    'Content-Type': 'text/html; charset=utf-8',
    ...(config.publicBaseUrl.startsWith('https://') ? { 'Strict-Transport-Security': 'max-age=31536000; includeSubDomains' } : {}),
  };
  const notFound = toCached(404, renderLotNotFound());
  const limiter = rateLimit({
    windowMs: 60_000, limit: config.lotPageLimitPerMinute ?? 300, standardHeaders: 'draft-8', legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).set({ ...headers, 'Retry-After': '60', 'Cache-Control': 'no-store' }).send(renderLotTooMany());
    },
  });
  return Router().get('/lot/:publicCode', allow('public'), limiter, async (req, res) => {
    res.set(headers);
    const code = String(req.params.publicCode);
    if (!PUBLIC_CODE_PATTERN.test(code)) return void send(res, notFound);
    const t = now().getTime();
    const hit = cache.get(code);
    if (hit && hit.expires > t) return void send(res, hit);
    const view = await loadLotPage(db, code);
    const entry = view ? toCached(200, renderLotPage(view), t + CACHE_MS) : { ...notFound, expires: t + CACHE_MS };
    if (cache.size >= CACHE_MAX) cache.clear();
    cache.set(code, entry);
    send(res, entry);
  });
}

interface CachedPage { expires: number; status: number; body: Buffer; etag: string }

// The body and its ETag are made once per render, not on every cache hit.
function toCached(status: number, html: string, expires = 0): CachedPage {
  const body = Buffer.from(html);
  return { expires, status, body, etag: `"${crypto.createHash('sha1').update(body).digest('base64url')}"` };
}

function send(res: Response, page: CachedPage) {
  res.status(page.status).set('ETag', page.etag).send(page.body);
}
