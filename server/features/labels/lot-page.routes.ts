import { Router } from 'express';
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
  const cache = new Map<string, { expires: number; status: number; html: string }>();
  liveCaches.add(cache);
  const limiter = rateLimit({
    windowMs: 60_000, limit: config.lotPageLimitPerMinute ?? 300, standardHeaders: 'draft-8', legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).set({ 'Content-Security-Policy': LOT_PAGE_CSP, 'Retry-After': '60', 'Cache-Control': 'no-store' }).type('html').send(renderLotTooMany());
    },
  });
  return Router().get('/lot/:publicCode', allow('public'), limiter, async (req, res) => {
    res.set({
      'Content-Security-Policy': LOT_PAGE_CSP,
      'X-Robots-Tag': 'noindex, nofollow',
      'Cache-Control': 'public, max-age=10',
      'Referrer-Policy': 'no-referrer',
    });
    res.type('html');
    const code = String(req.params.publicCode);
    if (!PUBLIC_CODE_PATTERN.test(code)) return void res.status(404).send(renderLotNotFound());
    const t = now().getTime();
    const hit = cache.get(code);
    if (hit && hit.expires > t) return void res.status(hit.status).send(hit.html);
    const view = await loadLotPage(db, code);
    const entry = view ? { status: 200, html: renderLotPage(view) } : { status: 404, html: renderLotNotFound() };
    if (cache.size >= CACHE_MAX) cache.clear();
    cache.set(code, { expires: t + CACHE_MS, ...entry });
    res.status(entry.status).send(entry.html);
  });
}
