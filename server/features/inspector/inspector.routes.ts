import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { CreateInspectorLinkInputSchema, InspectorLinkParamsSchema } from '../../../shared/contracts/inspector';
import { DocumentVersionParamsSchema } from '../../../shared/contracts/documents';
import { sendStoredFile } from '../../lib/uploads';
import { regenerateSession, saveSession, ensureCsrfToken, destroySession } from '../auth/session-helpers';
import { documentFile } from '../documents/documents.service';
import { sameSiteOnly } from '../documents/documents.routes';
import { allergenMatrix } from '../recipes/recipes.service';
import { sendAuditPacket } from '../records/audit-packet.routes';
import {
  createInspectorLink,
  inspectorRecords,
  inspectorSession,
  linkForToken,
  listInspectorLinks,
  logInspectorView,
  revokeInspectorLink,
  visitorHash,
} from './inspector-links.service';

export function inspectorLinksRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow('owner'), async (req, res) => {
      res.json({ links: await listInspectorLinks(db, req.actor!, deps.now()) });
    })
    .post('/', allow('owner'), async (req, res) => {
      const input = CreateInspectorLinkInputSchema.parse(req.body);
      res.status(201).json(await createInspectorLink(db, req.actor!, input, deps.config.publicBaseUrl, deps.now()));
    })
    .delete('/:linkId', allow('owner'), async (req, res) => {
      const { linkId } = InspectorLinkParamsSchema.parse(req.params);
      await revokeInspectorLink(db, req.actor!, linkId, deps.now());
      res.status(204).end();
    });
}

/** What an inspector's session may read; every request is logged as a view of the link. */
export function inspectorRouter(deps: AppDeps) {
  const { db } = deps;
  const logView: RequestHandler = async (req, res, next) => {
    res.set('Referrer-Policy', 'no-referrer');
    if (req.actor?.kind === 'inspector' && req.session.inspectorLinkId) {
      await logInspectorView(db, { id: req.session.inspectorLinkId, businessId: req.actor.businessId }, req.originalUrl.split('?')[0]!, visitorHash(deps.config.sessionSecret, req.ip ?? ''), deps.now());
    }
    next();
  };
  const linkId = (req: Parameters<RequestHandler>[0]) => req.session.inspectorLinkId!;
  return Router()
    .use(logView)
    .get('/session', allow('inspector'), async (req, res) => {
      res.json(await inspectorSession(db, req.actor!, linkId(req), true));
    })
    .get('/records', allow('inspector'), async (req, res) => {
      res.json(await inspectorRecords(db, req.actor!, linkId(req), deps.now()));
    })
    // The packet for exactly the link's range: an inspector cannot choose another one.
    .post('/audit-packet', allow('inspector'), async (req, res) => {
      const s = await inspectorSession(db, req.actor!, linkId(req), true);
      await sendAuditPacket(deps, req, res, { from: s.rangeFrom, to: s.rangeTo });
    })
    .get('/allergen-matrix', allow('inspector'), async (req, res) => {
      res.json(await allergenMatrix(db, req.actor!, {}));
    })
    .get('/documents/:documentId/versions/:versionId/download', allow('inspector'), sameSiteOnly, async (req, res) => {
      const { documentId, versionId } = DocumentVersionParamsSchema.parse(req.params);
      const v = await documentFile(db, req.actor!.businessId, documentId, versionId);
      sendStoredFile(res, await deps.storage.open(v.storageKey), { contentType: v.contentType, displayName: v.displayName, byteSize: v.byteSize });
    });
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
function plainPage(title: string, message: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><meta name="robots" content="noindex"><title>${escapeHtml(title)} · Crumbtrail</title></head><body style="font-family:system-ui,sans-serif;max-width:36rem;margin:3rem auto;padding:0 1rem;line-height:1.5"><h1>${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p></body></html>`;
}

const ENDED: Record<string, [number, string, string]> = {
  expired: [410, 'This inspection link has expired', 'Ask the business for a new link if you still need to see their records.'],
  revoked: [410, 'This inspection link was withdrawn', 'The business has turned this link off. Ask them for a new one if you still need it.'],
  unknown: [404, 'This inspection link does not work', 'Check that the whole address was copied from the e-mail, or ask the business for a new link.'],
};

/**
 * GET /inspect/<token>: swaps the token for a read-only inspector session cookie, then redirects
 * (303) to /inspector so the token leaves the address bar and is never sent as a referrer.
 */
export function inspectorExchangeRoute(deps: AppDeps): RequestHandler {
  return async (req, res) => {
    res.set({ 'Referrer-Policy': 'no-referrer', 'Cache-Control': 'no-store', 'X-Robots-Tag': 'noindex' });
    const now = deps.now();
    const { link, status } = await linkForToken(deps.db, String(req.params.token ?? ''), now);
    if (!link || status !== 'active') {
      if (req.session?.kind === 'inspector') await destroySession(req);
      const [code, title, message] = ENDED[status] ?? ENDED.unknown!;
      res.status(code).type('html').send(plainPage(title, message));
      return;
    }
    await regenerateSession(req);
    Object.assign(req.session, { kind: 'inspector', inspectorLinkId: link.id, businessId: link.businessId, createdAt: now.getTime(), lastSeenAt: now.getTime(), userAgent: (req.get('user-agent') ?? '').slice(0, 200) });
    req.session.cookie.maxAge = link.expiresAt.getTime() - now.getTime();
    ensureCsrfToken(req);
    await saveSession(req);
    await logInspectorView(deps.db, link, '/inspect', visitorHash(deps.config.sessionSecret, req.ip ?? ''), now);
    res.redirect(303, '/inspector');
  };
}

/** The inspector screen itself is the SPA; it still must never leak its address as a referrer. */
export const noReferrer: RequestHandler = (_req, res, next) => {
  res.set('Referrer-Policy', 'no-referrer');
  next();
};
