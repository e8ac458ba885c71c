import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import { HttpError } from '../../lib/http-error';
import { checkUploadedFile, sendStoredFile, singleFileUpload } from '../../lib/uploads';
import {
  CalendarFeedParamsSchema,
  CreateCalendarFeedInputSchema,
  CreateDocumentInputSchema,
  DocumentParamsSchema,
  DocumentVersionParamsSchema,
  NewDocumentVersionInputSchema,
} from '../../../shared/contracts/documents';
import { addDocumentVersion, createDocument, DOCUMENT_FILE_KINDS, documentFile, documentsExpiringSoon, getDocument, listDocuments } from './documents.service';
import { createCalendarFeed, listCalendarFeeds, renderCalendarFeed, revokeCalendarFeed } from './calendar-feeds.service';
import { registerKitchenBoardSection } from '../holding/kitchen-board.service';

export const sameSiteOnly: RequestHandler = (req, _res, next) =>
  next(req.get('sec-fetch-site') === 'cross-site' ? new HttpError(403, 'forbidden', 'Open documents from Crumbtrail itself.') : undefined);

// Certificates and permits near expiry on the Kitchen board, so whoever is baking sees them too.
registerKitchenBoardSection({
  kind: 'documents_expiring',
  order: 40,
  async load(db, actor, now) {
    const items = await documentsExpiringSoon(db, actor.businessId, now);
    if (!items.length) return null;
    return { kind: 'documents_expiring', items: items.map((d) => ({ id: d.id, title: d.current.title, expiresOn: d.current.expiresOn!, daysLeft: d.daysLeft! })) };
  },
});

/**
 * Owners manage documents; bakers and helpers may list and open them (a permit or certificate is
 * often asked for in the kitchen). Documents hold no customer data.
 */
export function documentsRouter(deps: AppDeps) {
  const { db, storage } = deps;
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json(await listDocuments(db, req.actor!, deps.now()));
    })
    .post('/', allow('owner'), singleFileUpload('file'), async (req, res) => {
      const input = CreateDocumentInputSchema.parse(req.body);
      const file = await checkUploadedFile(req.file, DOCUMENT_FILE_KINDS);
      res.status(201).json(await createDocument(db, storage, req.actor!, input, file, deps.now()));
    })
    .get('/:documentId', allow(...MEMBERS), async (req, res) => {
      const { documentId } = DocumentParamsSchema.parse(req.params);
      res.json(await getDocument(db, req.actor!, documentId, deps.now()));
    })
    .post('/:documentId/versions', allow('owner'), singleFileUpload('file'), async (req, res) => {
      const { documentId } = DocumentParamsSchema.parse(req.params);
      await getDocument(db, req.actor!, documentId, deps.now());
      const input = NewDocumentVersionInputSchema.parse(req.body);
      const file = await checkUploadedFile(req.file, DOCUMENT_FILE_KINDS);
      res.status(201).json(await addDocumentVersion(db, storage, req.actor!, documentId, input, file, deps.now()));
    })
    .get('/:documentId/versions/:versionId/download', allow(...MEMBERS), sameSiteOnly, async (req, res) => {
      const { documentId, versionId } = DocumentVersionParamsSchema.parse(req.params);
      const v = await documentFile(db, req.actor!.businessId, documentId, versionId);
      sendStoredFile(res, await storage.open(v.storageKey), { contentType: v.contentType, displayName: v.displayName, byteSize: v.byteSize });
    });
}

export function calendarFeedsRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow('owner'), async (req, res) => {
      res.json({ feeds: await listCalendarFeeds(db, req.actor!) });
    })
    .post('/', allow('owner'), async (req, res) => {
      const input = CreateCalendarFeedInputSchema.parse(req.body);
      res.status(201).json(await createCalendarFeed(db, req.actor!, input, deps.config.publicBaseUrl, deps.now()));
    })
    .delete('/:feedId', allow('owner'), async (req, res) => {
      const { feedId } = CalendarFeedParamsSchema.parse(req.params);
      await revokeCalendarFeed(db, req.actor!, feedId, deps.now());
      res.status(204).end();
    });
}

/** GET /calendar/<token>.ics, outside /api: calendar apps fetch it with no session. */
export function calendarFeedPublicRoute(deps: AppDeps): RequestHandler {
  return async (req, res, next) => {
    const file = String(req.params.file ?? '');
    const token = file.endsWith('.ics') ? file.slice(0, -4) : '';
    res.set({ 'Cache-Control': 'private, no-store', 'Referrer-Policy': 'no-referrer', 'X-Robots-Tag': 'noindex' });
    try {
      if (!/^[A-Za-z0-9_-]{43}$/.test(token)) throw new HttpError(404, 'not_found', 'That calendar feed does not exist.');
      const body = await renderCalendarFeed(deps.db, token, deps.now());
      res.type('text/calendar; charset=utf-8').set('Content-Disposition', 'inline; filename="document-expiry.ics"').send(body);
    } catch (err) {
      if (err instanceof HttpError) return void res.status(err.status).type('text/plain; charset=utf-8').send(err.message);
      next(err);
    }
  };
}
