import { describe, expect, test } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import { holdingSeedStep } from '../../server/db/seed/holding';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import { listHoldingPeriods, listWrittenProcedures } from '../../server/features/holding/holding.service';
import { getKitchenBoard } from '../../server/features/holding/kitchen-board.service';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();

describe('holding demo step', () => {
  test('seeds running, due-soon, over-limit and closed periods with actions and the written procedure', async () => {
    const now = new Date();
    // Its own business (not seedDemo: one demo business per database, and seed.test.ts loads that one).
    const business = await createTestBusiness(t);
    const actors = Object.fromEntries((['owner', 'baker', 'helper'] as const).map((role) => [role, {
      kind: 'member', businessId: business.businessId, userId: business.members[role].userId, name: business.members[role].displayName, role,
    } satisfies Actor])) as Record<'owner' | 'baker' | 'helper', Actor>;
    await holdingSeedStep.run({ db: t.db, now, businessId: business.businessId, actors, publicBaseUrl: 'http://127.0.0.1:5180', uploadDir: path.join(os.tmpdir(), 'crumbtrail-holding-seed'), shared: new Map() });
    const actor = actors.owner;
    const board = await getKitchenBoard(t.db, actor, now);
    const timers = board.sections.find((s) => s.kind === 'holding_timers');
    if (timers?.kind !== 'holding_timers') throw new Error('no timers section');
    expect(timers.periods.map((p) => [p.kind, p.evaluation.status, p.needsAction])).toEqual([
      ['cooling', 'over_limit', true],
      ['display', 'due_soon', false],
      ['setting', 'within_limit', false],
    ]);
    expect(timers.periods[0]!.evaluation.requiredAction).toBe('reheat_or_discard');

    const all = await listHoldingPeriods(t.db, actor, { state: 'all' }, now);
    const actions = all.periods.flatMap((p) => p.actions.map((a) => a.action)).sort();
    expect(actions).toEqual(['discarded', 'reheated']);
    expect(all.periods.filter((p) => p.evaluation.status === 'completed')).toHaveLength(1);
    expect((await listWrittenProcedures(t.db, actor)).current?.version).toBe(1);
    expect(await verifyBusinessChain(t.db, business.businessId)).toMatchObject({ ok: true });
  }, 60_000);
});
