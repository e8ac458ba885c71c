import { Router, type Request } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import {
  AddReadingInputSchema, HoldingListQuerySchema, HoldingPeriodParamsSchema, IdempotencyKeySchema, RecordHoldingActionInputSchema,
  StartHoldingInputSchema, StopHoldingInputSchema, WrittenProcedureInputSchema,
} from '../../../shared/contracts/holding';
import { registerReleaseCheck } from '../batches/release-checks';
import {
  addHoldingReading, getHoldingPeriod, listHoldingPeriods, listWrittenProcedures, recordHoldingAction, saveWrittenProcedure,
  startHoldingPeriod, stopHoldingPeriod,
} from './holding.service';
import { holdingReleaseCheck, setHoldingClock } from './holding.queries';
import { getKitchenBoard } from './kitchen-board.service';

const KITCHEN = ['owner', 'baker', 'helper', 'device'] as const;

const idempotencyKey = (req: Request) => IdempotencyKeySchema.parse(req.get('Idempotency-Key') ?? undefined);

/** /api/holding-periods: timers out of temperature control, their readings, stops and actions. */
export function holdingRouter(deps: AppDeps) {
  const { db } = deps;
  setHoldingClock(deps.now);
  registerReleaseCheck(holdingReleaseCheck);
  return Router()
    .get('/', allow(...KITCHEN), async (req, res) => {
      const query = HoldingListQuerySchema.parse(req.query);
      res.json(await listHoldingPeriods(db, req.actor!, query, deps.now()));
    })
    .get('/:id', allow(...KITCHEN), async (req, res) => {
      const { id } = HoldingPeriodParamsSchema.parse(req.params);
      const now = deps.now();
      res.json({ period: await getHoldingPeriod(db, req.actor!, id, now), serverNow: now.toISOString() });
    })
    .post('/', allow(...KITCHEN), async (req, res) => {
      const input = StartHoldingInputSchema.parse(req.body);
      const now = deps.now();
      res.status(201).json({ period: await startHoldingPeriod(db, req.actor!, input, idempotencyKey(req), now), serverNow: now.toISOString() });
    })
    .post('/:id/readings', allow(...KITCHEN), async (req, res) => {
      const { id } = HoldingPeriodParamsSchema.parse(req.params);
      const input = AddReadingInputSchema.parse(req.body);
      const now = deps.now();
      res.status(201).json({ period: await addHoldingReading(db, req.actor!, id, input, idempotencyKey(req), now), serverNow: now.toISOString() });
    })
    .post('/:id/stop', allow(...KITCHEN), async (req, res) => {
      const { id } = HoldingPeriodParamsSchema.parse(req.params);
      const input = StopHoldingInputSchema.parse(req.body ?? {});
      const now = deps.now();
      res.json({ period: await stopHoldingPeriod(db, req.actor!, id, input, idempotencyKey(req), now), serverNow: now.toISOString() });
    })
    .post('/:id/actions', allow(...KITCHEN), async (req, res) => {
      const { id } = HoldingPeriodParamsSchema.parse(req.params);
      const input = RecordHoldingActionInputSchema.parse(req.body);
      const now = deps.now();
      res.status(201).json({ period: await recordHoldingAction(db, req.actor!, id, input, idempotencyKey(req), now), serverNow: now.toISOString() });
    });
}

/** /api/written-procedures: the business's written TPHC procedure (owner writes). */
export function writtenProceduresRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow('owner', 'baker', 'helper'), async (req, res) => {
      res.json(await listWrittenProcedures(db, req.actor!));
    })
    .post('/', allow('owner'), async (req, res) => {
      const input = WrittenProcedureInputSchema.parse(req.body);
      res.status(201).json(await saveWrittenProcedure(db, req.actor!, input, deps.now()));
    });
}

/** /api/kitchen-board: everything the kitchen screen shows, in one call. */
export function kitchenBoardRouter(deps: AppDeps) {
  const { db } = deps;
  return Router().get('/', allow(...KITCHEN), async (req, res) => {
    res.json(await getKitchenBoard(db, req.actor!, deps.now()));
  });
}
