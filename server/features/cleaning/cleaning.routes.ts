import { Router, type Request, type Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { AppDeps } from '../../app';
import { allow, EDITORS, MEMBERS } from '../../middleware/access';
import { HttpError } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { IdParamsSchema } from '../../../shared/contracts/errors';
import { IdempotencyKeySchema } from '../../../shared/contracts/batches';
import {
  AddCleaningStepInputSchema, CleaningRunListQuerySchema, CleaningTemplateInputSchema, CleaningTemplateUpdateSchema, CorrectCleaningRunInputSchema,
  EquipmentInputSchema, EquipmentListQuerySchema, EquipmentUpdateSchema, SanitiserProductInputSchema, SanitiserProductUpdateSchema,
  SignCleaningRunInputSchema, StartCleaningRunInputSchema,
} from '../../../shared/contracts/cleaning';
import {
  createCleaningTemplate, createEquipment, createSanitiserProduct, listCleaningTemplates, listEquipment, listSanitiserProducts,
  updateCleaningTemplate, updateEquipment, updateSanitiserProduct,
} from './cleaning-setup.service';
import {
  addCleaningStep, correctCleaningRun, getCleaningDue, getCleaningRun, listCleaningRuns, listCleaningSigners, signCleaningRun,
  startCleaningRun, type CleaningWriteOptions,
} from './cleaning.service';
import { registerKitchenBoardSection } from '../holding/kitchen-board.service';
import { cleaningsDueSection } from './cleaning-board';

const KITCHEN = [...MEMBERS, 'device'] as const;
const actorOf = (req: Request) => req.actor as Actor;

function writeOptions(req: Request, res: Response): CleaningWriteOptions {
  const key = req.get('Idempotency-Key');
  return { idempotencyKey: key === undefined ? undefined : IdempotencyKeySchema.parse(key), requestId: String(res.locals.requestId ?? '') || undefined };
}

/** /api/equipment: the equipment register (owners and bakers edit). */
export function equipmentRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...KITCHEN), async (req, res) => {
      res.json(await listEquipment(db, actorOf(req), EquipmentListQuerySchema.parse(req.query).includeArchived === 'true'));
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createEquipment(db, actorOf(req), EquipmentInputSchema.parse(req.body), now()));
    })
    .patch('/:id', allow(...EDITORS), async (req, res) => {
      res.json(await updateEquipment(db, actorOf(req), IdParamsSchema.parse(req.params).id, EquipmentUpdateSchema.parse(req.body), now()));
    });
}

/** /api/sanitiser-products: products with their label ranges (owners and bakers add and archive). */
export function sanitiserProductsRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...KITCHEN), async (req, res) => {
      res.json(await listSanitiserProducts(db, actorOf(req)));
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createSanitiserProduct(db, actorOf(req), SanitiserProductInputSchema.parse(req.body), now()));
    })
    .patch('/:id', allow(...EDITORS), async (req, res) => {
      res.json(await updateSanitiserProduct(db, actorOf(req), IdParamsSchema.parse(req.params).id, SanitiserProductUpdateSchema.parse(req.body), now()));
    });
}

/** /api/cleaning-templates: checklists (owners and bakers edit). */
export function cleaningTemplatesRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...KITCHEN), async (req, res) => {
      res.json(await listCleaningTemplates(db, actorOf(req)));
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createCleaningTemplate(db, actorOf(req), CleaningTemplateInputSchema.parse(req.body), now()));
    })
    .patch('/:id', allow(...EDITORS), async (req, res) => {
      res.json(await updateCleaningTemplate(db, actorOf(req), IdParamsSchema.parse(req.params).id, CleaningTemplateUpdateSchema.parse(req.body), now()));
    });
}

/** /api/cleaning-runs: runs, their steps, signatures and corrections. */
export function cleaningRunsRouter(deps: AppDeps) {
  const { db, now, config } = deps;
  registerKitchenBoardSection(cleaningsDueSection);
  // Wrong signing passwords count per person signed for (as sign-in does per account): a tablet is
  // not a way to guess a member's password.
  const signLimit = rateLimit({
    windowMs: config.signInWindowMs, limit: config.signInLimitPerAccount, standardHeaders: 'draft-8', legacyHeaders: false,
    keyGenerator: (req) => `sign:${req.actor?.businessId}:${String(req.body?.signerUserId ?? req.actor?.userId ?? '')}`,
    requestWasSuccessful: (_req, res) => res.statusCode !== 403,
    skipSuccessfulRequests: true,
    handler: (_req, res, next) => next(new HttpError(429, 'rate_limited', 'Too many wrong passwords. Wait a few minutes and try again.', undefined, { 'Retry-After': String(res.getHeader('Retry-After') ?? 60) })),
  });
  return Router()
    .get('/', allow(...KITCHEN), async (req, res) => {
      res.json(await listCleaningRuns(db, actorOf(req), CleaningRunListQuerySchema.parse(req.query), now()));
    })
    .get('/due', allow(...KITCHEN), async (req, res) => {
      res.json(await getCleaningDue(db, actorOf(req).businessId, now()));
    })
    .get('/signers', allow(...KITCHEN), async (req, res) => {
      res.json(await listCleaningSigners(db, actorOf(req)));
    })
    .get('/:id', allow(...KITCHEN), async (req, res) => {
      res.json(await getCleaningRun(db, actorOf(req), IdParamsSchema.parse(req.params).id));
    })
    .post('/', allow(...KITCHEN), async (req, res) => {
      const opts = writeOptions(req, res);
      res.status(201).json(await startCleaningRun(db, actorOf(req), StartCleaningRunInputSchema.parse(req.body), opts, now()));
    })
    .post('/:id/steps', allow(...KITCHEN), async (req, res) => {
      const opts = writeOptions(req, res);
      const { id } = IdParamsSchema.parse(req.params);
      res.status(201).json(await addCleaningStep(db, actorOf(req), id, AddCleaningStepInputSchema.parse(req.body), opts, now()));
    })
    .post('/:id/signatures', allow(...KITCHEN), signLimit, async (req, res) => {
      const opts = writeOptions(req, res);
      const { id } = IdParamsSchema.parse(req.params);
      res.status(201).json(await signCleaningRun(db, actorOf(req), id, SignCleaningRunInputSchema.parse(req.body), opts, now()));
    })
    .post('/:id/corrections', allow(...MEMBERS), async (req, res) => {
      const opts = writeOptions(req, res);
      const { id } = IdParamsSchema.parse(req.params);
      res.status(201).json(await correctCleaningRun(db, actorOf(req), id, CorrectCleaningRunInputSchema.parse(req.body), opts, now()));
    });
}
