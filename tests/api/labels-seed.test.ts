import { describe, expect, test } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import { labelledBatch, setBusinessContact } from '../support/label-batches';
import { labelsSeedStep } from '../../server/db/seed/labels';
import { labelPrintRuns } from '../../server/db/schema/labels';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();

describe('labels demo step', () => {
  test('prints runs for released batches through the labels service, skipping batches the check refuses', async () => {
    const business = await createTestBusiness(t, { ruleProfileId: 'us-tx-2025-09' });
    await setBusinessContact(t, business.businessId, { ruleProfileId: 'us-tx-2025-09' });
    const actors = Object.fromEntries((['owner', 'baker', 'helper'] as const).map((role) => [role, {
      kind: 'member', businessId: business.businessId, userId: business.members[role].userId, name: business.members[role].displayName, role,
    } satisfies Actor])) as Record<'owner' | 'baker' | 'helper', Actor>;
    const a = await labelledBatch(t, business.businessId, actors.owner);
    const b = await labelledBatch(t, business.businessId, actors.owner);
    await labelledBatch(t, business.businessId, actors.owner, { state: 'in_progress' }); // not picked: not released
    await labelsSeedStep.run({ db: t.db, now: t.clock.now, businessId: business.businessId, actors, publicBaseUrl: 'http://127.0.0.1:5180', uploadDir: path.join(os.tmpdir(), 'crumbtrail-labels-seed'), shared: new Map() });
    const runs = await t.db.select().from(labelPrintRuns).where(eq(labelPrintRuns.businessId, business.businessId));
    expect(runs.map((r) => r.batchId).sort()).toEqual([a.batch.id, b.batch.id].sort());
    expect(runs.map((r) => r.templateId).sort()).toEqual(['rect-3x2in', 'square-2in']);
    expect(runs.every((r) => r.lotUrl.startsWith('http://127.0.0.1:5180/lot/'))).toBe(true);
    expect(await verifyBusinessChain(t.db, business.businessId)).toMatchObject({ ok: true });
  }, 60_000);
});
