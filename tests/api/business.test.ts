import { beforeAll, describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, type ApiAgent, type TestBusiness } from '../support/agents';
import { businesses } from '../../server/db/schema/business';
import { recordEvents } from '../../server/db/schema/record-events';

const t = makeTestApp();
let business: TestBusiness;
let owner: ApiAgent;
let baker: ApiAgent;
let helper: ApiAgent;

beforeAll(async () => {
  ({ business, owner, baker, helper } = await businessWithAgents(t));
});

describe('GET /api/business', () => {
  test('every member reads the business profile with its rule profile name', async () => {
    for (const agent of [owner, baker, helper]) {
      const res = await agent.get('/api/business');
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ id: business.businessId, name: business.name, ruleProfileId: 'us-federal-2025-01', lotCodeTemplate: '{PREFIX}-{YY}{DDD}-{SEQ}' });
      expect(res.body.ruleProfileName).toMatch(/United States/);
    }
  });
});

describe('PATCH /api/business', () => {
  test('the owner changes fields; one record event lists each change with before and after', async () => {
    const res = await owner.patch('/api/business').send({
      phone: '(555) 010-9999', timeZone: 'America/Denver', ruleProfileId: 'us-tx-2025-09', lotCodePrefix: 'MB', lotCodeTemplate: '{PREFIX}{YYYY}{MM}{DD}-{SEQ}', registrationAuthority: 'Invented County Health',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ timeZone: 'America/Denver', ruleProfileId: 'us-tx-2025-09', lotCodePrefix: 'MB', lotCodeTemplate: '{PREFIX}{YYYY}{MM}{DD}-{SEQ}' });
    const [row] = await t.db.select().from(businesses).where(eq(businesses.id, business.businessId));
    expect(row!.lotCodeScheme).toBe('{PREFIX}{YYYY}{MM}{DD}-{SEQ}');
    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, business.businessId), eq(recordEvents.action, 'update')));
    expect(events).toHaveLength(1);
    expect((events[0]!.payload as { changes: Record<string, unknown> }).changes).toMatchObject({
      timeZone: { from: 'America/Chicago', to: 'America/Denver' }, lotCodeTemplate: { from: '{PREFIX}-{YY}{DDD}-{SEQ}', to: '{PREFIX}{YYYY}{MM}{DD}-{SEQ}' },
    });
    // Sending the same values again changes nothing and writes no event.
    await owner.patch('/api/business').send({ timeZone: 'America/Denver' });
    expect(await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, business.businessId), eq(recordEvents.action, 'update')))).toHaveLength(1);
  });

  test('bad values answer 400 naming each field', async () => {
    const res = await owner.patch('/api/business').send({ timeZone: 'Mars/Olympus', lotCodeTemplate: '{PREFIX}-{SEQ}', lotCodePrefix: 'too-long-x', email: 'nope', name: '' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fieldErrors).sort()).toEqual(['email', 'lotCodePrefix', 'lotCodeTemplate', 'name', 'timeZone']);
    expect(res.body.error.fieldErrors.timeZone).toEqual(['Use an IANA time zone such as America/Chicago']);
    expect(res.body.error.fieldErrors.lotCodeTemplate[0]).toMatch(/full date/);
    expect((await owner.patch('/api/business').send({ ruleProfileId: 'no-such-profile' })).body.error.fieldErrors).toEqual({ ruleProfileId: ['Choose a rule profile from the list'] });
    expect((await owner.patch('/api/business').send({ isDemo: true })).status).toBe(400);
  });

  test('bakers and helpers may not edit', async () => {
    expect((await baker.patch('/api/business').send({ phone: '1' })).status).toBe(403);
    expect((await helper.patch('/api/business').send({ phone: '1' })).status).toBe(403);
  });
});
