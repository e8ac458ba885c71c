import { describe, expect, test } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { cleaningSeedStep } from '../../server/db/seed/cleaning';
import { DEMO_ACCOUNTS } from '../../server/db/seed/demo-accounts';
import { users } from '../../server/db/schema/auth';
import { hashPassword } from '../../server/features/auth/passwords';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import { getCleaningDue, listCleaningRunsForRange } from '../../server/features/cleaning/cleaning.service';
import { addCalendarDays } from '../../shared/domain/calendar-date';
import { businessLocalDate } from '../../shared/domain/zoned-time';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();

describe('cleaning demo step', () => {
  test('seeds equipment, two checklists, signed runs by helper and baker, a redone chlorine check, a correction and a run in progress today', async () => {
    const now = new Date();
    // Its own business (seed.test.ts loads the one demo business); members get the demo passwords, as the seed signs with them.
    const business = await createTestBusiness(t);
    const actors = {} as Record<'owner' | 'baker' | 'helper', Actor>;
    for (const role of ['owner', 'baker', 'helper'] as const) {
      const m = business.members[role];
      await t.db.update(users).set({ passwordHash: await hashPassword(DEMO_ACCOUNTS.find((a) => a.role === role)!.password, t.config.hashParams) }).where(eq(users.id, m.userId));
      actors[role] = { kind: 'member', businessId: business.businessId, userId: m.userId, name: m.displayName, role };
    }
    const { recipeVersion } = await createSimpleRecipe(t, business.businessId);
    const today = businessLocalDate(now, 'America/Chicago');
    await createBatch(t, business.businessId, { recipeVersionId: recipeVersion.id, madeOn: addCalendarDays(today, -6) }, actors.baker);
    await createBatch(t, business.businessId, { recipeVersionId: recipeVersion.id, madeOn: addCalendarDays(today, -2) }, actors.baker);
    await cleaningSeedStep.run({ db: t.db, now, businessId: business.businessId, actors, publicBaseUrl: 'http://127.0.0.1:5180', uploadDir: path.join(os.tmpdir(), 'crumbtrail-cleaning-seed'), shared: new Map() });

    const runs = await listCleaningRunsForRange(t.db, business.businessId, { from: addCalendarDays(today, -30), to: today });
    expect(runs).toHaveLength(14 + 2 + 1);
    expect(runs.filter((r) => r.status === 'signed')).toHaveLength(16);
    const inProgress = runs.filter((r) => r.status === 'in_progress');
    expect(inProgress.map((r) => [r.runDate, r.versions[0]!.entries.length])).toEqual([[today, 2]]);
    expect(runs.filter((r) => r.batchId)).toHaveLength(2);
    const signers = new Set(runs.flatMap((r) => r.versions.flatMap((v) => (v.signature ? [v.signature.printedName] : []))));
    expect(signers).toEqual(new Set([actors.helper.name, actors.baker.name]));
    const redone = runs.filter((r) => r.versions[0]!.entries.some((e) => e.sanitising && !e.sanitising.passed));
    expect(redone).toHaveLength(1);
    expect(redone[0]!.versions[0]!.entries.filter((e) => e.sanitising).map((e) => [e.sanitising!.sanitiser, e.sanitising!.passed])).toEqual([['chlorine', false], ['chlorine', true]]);
    const corrected = runs.filter((r) => r.currentVersion === 2);
    expect(corrected).toHaveLength(1);
    expect(corrected[0]!.versions[0]!.reason).toMatch(/thermometer log/);
    expect(corrected[0]!.versions.map((v) => v.signature?.validity)).toEqual(['valid', 'valid']);
    expect(runs.every((r) => r.versions.every((v) => !v.signature || v.signature.validity === 'valid'))).toBe(true);

    const due = await getCleaningDue(t.db, business.businessId, now);
    expect(due.equipment.map((e) => e.name).sort()).toEqual(['Cake-pop moulds', 'Counters', 'Dipping pots', 'Sheet pans', 'Stand mixer bowl']);
    expect(due.dailyTemplatesNotStarted).toEqual([]);
    expect(await verifyBusinessChain(t.db, business.businessId)).toMatchObject({ ok: true });
  }, 120_000);
});
