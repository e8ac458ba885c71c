import { Router, type Request, type Response } from 'express';
import type { AppDeps } from '../../app';
import { allow, EDITORS } from '../../middleware/access';
import type { Actor } from '../../lib/actor';
import { LabelCheckQuerySchema, ListPrintRunsQuerySchema, PrintLabelsInputSchema } from '../../../shared/contracts/labels';
import { checkBatchLabel, listPrintRuns, previewLabels, printLabels, type LabelPdfAnswer } from './labels.service';

const actorOf = (req: Request) => req.actor as Actor;

function sendPdf(res: Response, pdf: LabelPdfAnswer, disposition: 'inline' | 'attachment') {
  res.type('application/pdf');
  res.set('Content-Disposition', `${disposition}; filename="${pdf.filename}"`);
  if (pdf.printRunId) res.set('X-Print-Run-Id', pdf.printRunId);
  res.send(Buffer.from(pdf.bytes));
}

/** Label check, preview and printing (owner and baker; helpers do not print). */
export function labelsRouter({ db, now, config }: AppDeps) {
  const ctx = () => ({ now: now(), publicBaseUrl: config.publicBaseUrl });
  return Router()
    .get('/check', allow(...EDITORS), async (req, res) => {
      res.json(await checkBatchLabel(db, actorOf(req), LabelCheckQuerySchema.parse(req.query), ctx()));
    })
    .post('/preview', allow(...EDITORS), async (req, res) => {
      sendPdf(res, await previewLabels(db, actorOf(req), PrintLabelsInputSchema.parse(req.body), ctx()), 'inline');
    })
    .get('/print-runs', allow(...EDITORS), async (req, res) => {
      res.json(await listPrintRuns(db, actorOf(req), ListPrintRunsQuerySchema.parse(req.query)));
    })
    .post('/print-runs', allow(...EDITORS), async (req, res) => {
      res.status(201);
      sendPdf(res, await printLabels(db, actorOf(req), PrintLabelsInputSchema.parse(req.body), ctx()), 'attachment');
    });
}
