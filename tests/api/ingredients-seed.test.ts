import { afterAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { testDb, testPool } from '../support/db';
import { createTestBusiness } from '../support/agents';
import type { TestApp } from '../support/app';
import { DEFAULT_HASH_PARAMS } from '../../server/features/auth/passwords';
import { ingredientsSeedStep } from '../../server/db/seed/ingredients';
import { ingredientLabelFiles } from '../../server/db/schema/ingredients';
import { listIngredients } from '../../server/features/ingredients/ingredients.service';
import { listSupplierLots } from '../../server/features/ingredients/supplier-lots.service';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import type { Actor } from '../../server/lib/actor';

const pool = testPool('runtime');
const db = testDb(pool);
const uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-ing-seed-'));
afterAll(async () => {
  await pool.end();
  fs.rmSync(uploadDir, { recursive: true, force: true });
});

describe('the demo shelf', () => {
  test('stocks ingredients with lots, re-checks, label files, one unverified, one TCS, and a verifying chain', async () => {
    const now = new Date();
    // A fresh business rather than the demo itself, so this can run beside the whole-demo test.
    const business = await createTestBusiness({ db, config: { hashParams: DEFAULT_HASH_PARAMS } } as unknown as TestApp, { timeZone: 'America/Chicago' });
    const member = (role: 'owner' | 'baker' | 'helper'): Actor => ({ kind: 'member', businessId: business.businessId, userId: business.members[role].userId, name: business.members[role].displayName, role });
    await ingredientsSeedStep.run({ db, now, businessId: business.businessId, actors: { owner: member('owner'), baker: member('baker'), helper: member('helper') }, publicBaseUrl: 'http://127.0.0.1', uploadDir, shared: new Map() });
    const demo = { id: business.businessId };
    const actor = member('helper');
    const items = await listIngredients(db, actor, {});
    expect(items.length).toBeGreaterThanOrEqual(14);
    expect(items.filter((i) => !i.isVerified).map((i) => i.labelName)).toEqual(['Sky blue gel food colour']);
    expect(items.filter((i) => i.needsTimeTemperatureControl).map((i) => i.labelName)).toEqual(['Cream cheese']);
    expect(items.filter((i) => i.needsLabelRecheck).map((i) => i.labelName)).toEqual(['Rainbow sprinkles']);
    expect(items.find((i) => i.labelName === 'Blanched almond flour')!.allergens).toEqual([{ source: 'tree_nut', kind: 'almond' }]);
    const lots = await listSupplierLots(db, actor);
    const oldest = new Date(now.getTime() - 61 * 86_400_000).toISOString().slice(0, 10);
    expect(lots.every((l) => l.receivedOn >= oldest)).toBe(true);
    expect(lots.some((l) => l.labelChecks[0]?.outcome === 'changed')).toBe(true);
    const files = await db.select().from(ingredientLabelFiles).where(eq(ingredientLabelFiles.businessId, demo.id));
    expect(files.length).toBeGreaterThanOrEqual(5);
    for (const f of files) expect(fs.existsSync(path.join(uploadDir, f.storageKey.slice(0, 2), f.storageKey))).toBe(true);
    expect(await verifyBusinessChain(db, demo.id)).toMatchObject({ ok: true });
  }, 60_000);
});
