import { Router, type Request, type Response } from 'express';
import { forgetCachedLotPages } from '../labels/lot-page.routes';
import type { AppDeps } from '../../app';
import { allow, EDITORS, MEMBERS } from '../../middleware/access';
import type { Actor } from '../../lib/actor';
import { IdParamsSchema } from '../../../shared/contracts/errors';
import {
  ChangeBatchStateInputSchema, CorrectBatchInputSchema, CreateBatchInputSchema, IdempotencyKeySchema, ListBatchesQuerySchema, LotCandidatesQuerySchema,
} from '../../../shared/contracts/batches';
import {
  changeBatchState, correctBatch, createBatch, getBatchDetail, getBatchLotCandidates, getLotCandidates, listBatches, listBatchRecipeOptions, type WriteOptions,
} from './batches.service';

const actorOf = (req: Request) => req.actor as Actor;

function writeOptions(req: Request, res: Response): WriteOptions {
  const key = req.get('Idempotency-Key');
  return { idempotencyKey: key === undefined ? undefined : IdempotencyKeySchema.parse(key), requestId: String(res.locals.requestId ?? '') || undefined };
}

export function batchesRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json(await listBatches(db, actorOf(req), ListBatchesQuerySchema.parse(req.query)));
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      const opts = writeOptions(req, res);
      res.status(201).json(await createBatch(db, actorOf(req), CreateBatchInputSchema.parse(req.body), now(), opts));
    })
    .get('/recipe-options', allow(...MEMBERS), async (req, res) => {
      res.json(await listBatchRecipeOptions(db, actorOf(req)));
    })
    .get('/lot-candidates', allow(...MEMBERS), async (req, res) => {
      res.json(await getLotCandidates(db, actorOf(req), LotCandidatesQuerySchema.parse(req.query).recipeVersionId));
    })
    .get('/:id', allow(...MEMBERS), async (req, res) => {
      res.json(await getBatchDetail(db, actorOf(req), IdParamsSchema.parse(req.params).id));
    })
    .get('/:id/lot-candidates', allow(...MEMBERS), async (req, res) => {
      res.json(await getBatchLotCandidates(db, actorOf(req), IdParamsSchema.parse(req.params).id));
    })
    .post('/:id/versions', allow(...EDITORS), async (req, res) => {
      const opts = writeOptions(req, res);
      const { id } = IdParamsSchema.parse(req.params);
      res.status(201).json(await correctBatch(db, actorOf(req), id, CorrectBatchInputSchema.parse(req.body), now(), opts));
    })
    .post('/:id/state', allow(...EDITORS), async (req, res) => {
      const opts = writeOptions(req, res);
      const { id } = IdParamsSchema.parse(req.params);
      res.json(await changeBatchState(db, actorOf(req), id, ChangeBatchStateInputSchema.parse(req.body), now(), opts));
      forgetCachedLotPages();
    });
}
