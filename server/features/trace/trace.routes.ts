import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import { IdParamsSchema } from '../../../shared/contracts/errors';
import { CloseRecallInputSchema, OpenRecallInputSchema, PhoneNoticeInputSchema, RecallCustomerParamsSchema, TraceQuerySchema } from '../../../shared/contracts/trace';
import { registerRecallNoticeProvider } from '../labels/lot-page';
import { forgetCachedLotPages } from '../labels/lot-page.routes';
import { trace, traceOptions, traceReport } from './trace.service';
import { closeRecall, getRecall, listRecalls, markToldByPhone, openRecall, recallNoticeForBatch } from './recalls.service';

// The public lot page of a recalled batch shows the recall's notice.
registerRecallNoticeProvider(recallNoticeForBatch);

/** Trace forward and backward: every member reads (inspectors see recalls in their packet); contacts only reach the owner. */
export function traceRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json(await trace(db, req.actor!, TraceQuerySchema.parse(req.query), now()));
    })
    .get('/options', allow(...MEMBERS), async (req, res) => {
      res.json(await traceOptions(db, req.actor!));
    })
    .get('/report.pdf', allow(...MEMBERS), async (req, res) => {
      const { bytes, fileName } = await traceReport(db, req.actor!, TraceQuerySchema.parse(req.query), now());
      res.set({ 'Content-Type': 'application/pdf', 'Content-Disposition': `inline; filename="${fileName}"`, 'Cache-Control': 'no-store' });
      res.send(Buffer.from(bytes));
    });
}

/** Recalls: only the owner opens, closes or records a phone call; others read progress without contacts. */
export function recallsRouter({ db, now, config }: AppDeps) {
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json({ items: await listRecalls(db, req.actor!) });
    })
    .post('/', allow('owner'), async (req, res) => {
      res.status(201).json(await openRecall(db, req.actor!, OpenRecallInputSchema.parse(req.body), now(), config.publicBaseUrl));
      forgetCachedLotPages();
    })
    .get('/:id', allow(...MEMBERS), async (req, res) => {
      res.json(await getRecall(db, req.actor!, IdParamsSchema.parse(req.params).id));
    })
    .post('/:id/close', allow('owner'), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      res.json(await closeRecall(db, req.actor!, id, CloseRecallInputSchema.parse(req.body), now()));
      forgetCachedLotPages();
    })
    .post('/:id/customers/:customerId/phone', allow('owner'), async (req, res) => {
      const { id, customerId } = RecallCustomerParamsSchema.parse(req.params);
      res.json(await markToldByPhone(db, req.actor!, id, customerId, PhoneNoticeInputSchema.parse(req.body), now()));
    });
}
