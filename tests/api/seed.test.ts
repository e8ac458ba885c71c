import { afterAll, describe, expect, test } from 'vitest';
import { freshDatabase } from '../support/db';
import { eq } from 'drizzle-orm';
import os from 'node:os';
import path from 'node:path';
import { makeTestApp } from '../support/app';
import { seedDemo } from '../../server/db/seed/demo';
import { DEMO_STEPS } from '../../server/db/seed/steps';
import { businesses } from '../../server/db/schema/business';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import { ApiAgent } from '../support/agents';
import { DEMO_ACCOUNTS } from '../../server/db/seed/demo-accounts';

// A database of its own: other files (browser tests) may load the demo into the shared per-run one.
const fresh = await freshDatabase('seed');
afterAll(() => fresh.drop());
const t = makeTestApp({ config: { demoMode: true, demoAccounts: DEMO_ACCOUNTS }, databaseUrl: fresh.runtimeUrl });

describe('the invented demo', () => {
  test('loads every feature step once, and its record chain verifies', async () => {
    const options = { publicBaseUrl: 'http://127.0.0.1:5180', uploadDir: path.join(os.tmpdir(), `crumbtrail-seed-${process.pid}`) };
    expect(await seedDemo(t.db, DEMO_STEPS, options)).toBe(true);
    expect(await seedDemo(t.db, DEMO_STEPS, options)).toBe(false);
    const [demo] = await t.db.select().from(businesses).where(eq(businesses.isDemo, true));
    expect(demo!.name).toBe('Juniper Lane Cake Pops');
    expect(await verifyBusinessChain(t.db, demo!.id)).toMatchObject({ ok: true });
  }, 120_000);

  test('each demo account signs in with the password shown on the sign-in page', async () => {
    for (const account of DEMO_ACCOUNTS) {
      const agent = new ApiAgent(t.app);
      const res = await agent.signIn(account.email, account.password);
      expect(res.status).toBe(200);
      expect(res.body.user.role).toBe(account.role);
    }
  });
});
