import { beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, type ApiAgent } from '../support/agents';
import { customRuleProfileVersions } from '../../server/db/schema/rule-profiles';
import { recordEvents } from '../../server/db/schema/record-events';
import type { RuleProfileDetail, RuleProfileSummary } from '../../shared/contracts/custom-rule-profiles';

const t = makeTestApp();
let owner: ApiAgent;
let baker: ApiAgent;
let helper: ApiAgent;

beforeAll(async () => {
  ({ owner, baker, helper } = await businessWithAgents(t));
});

describe('GET /api/rule-profiles', () => {
  test('lists the shipped profiles with their unverified counts for every member', async () => {
    const res = await helper.get('/api/rule-profiles');
    expect(res.status).toBe(200);
    const ids = res.body.profiles.map((p: RuleProfileSummary) => p.id);
    expect(ids).toEqual(expect.arrayContaining(['us-federal-2025-01', 'us-tx-2025-09', 'eu-1169-2011']));
    // The Texas 2025 sales cap is shipped unverified (S.B. 541 figures disagree).
    expect(res.body.profiles.find((p: RuleProfileSummary) => p.id === 'us-tx-2025-09').unverifiedCount).toBeGreaterThan(0);
    const detail = await helper.get('/api/rule-profiles/us-tx-2025-09');
    expect(detail.body.profile.salesCap.source.verified).toBe(false);
    expect(detail.body.profile.caution).toMatch(/local health authority decide/);
    expect((await helper.get('/api/rule-profiles/no-such')).status).toBe(404);
  });
});

describe('copy and edit', () => {
  test('the owner copies Texas and edits one value as a new version; the old version stays', async () => {
    const created = await owner.post('/api/rule-profiles').send({ basedOnId: 'us-tx-2025-09', name: 'Millbrook County (our copy)' });
    expect(created.status).toBe(201);
    const copy = created.body as RuleProfileDetail;
    expect(copy.profile).toMatchObject({ isCustom: true, basedOnId: 'us-tx-2025-09', name: 'Millbrook County (our copy)', id: copy.profile.id });
    expect(copy.version).toBe(1);

    const edited = structuredClone(copy.profile);
    edited.salesCap = { value: { amount: 150000, currency: 'USD', year: 2026, period: 'calendar-year' }, source: { citation: 'Asked the county office (invented test)', verified: false, checkedOn: '2026-11-30' } };
    const saved = await owner.post(`/api/rule-profiles/${copy.profile.id}/versions`).send({ profile: edited, reason: 'County confirmed the higher cap', basedOnVersion: 1 });
    expect(saved.status, JSON.stringify(saved.body)).toBe(201);
    expect(saved.body.version).toBe(2);
    expect(saved.body.profile.salesCap.value.amount).toBe(150000);
    expect(saved.body.versions.map((v: { reason: string }) => v.reason)).toEqual(['Copied from Texas — cottage food (from 1 Sep 2025, S.B. 541)', 'County confirmed the higher cap']);
    const rows = await t.db.select().from(customRuleProfileVersions).where(eq(customRuleProfileVersions.profileId, copy.profile.id));
    expect(rows.find((r) => r.version === 1)!.profile.salesCap.value?.amount).toBe(100000);
    const events = await t.db.select().from(recordEvents).where(eq(recordEvents.entityId, copy.profile.id));
    expect(events.map((e) => e.action)).toEqual(['create', 'update']);

    const stale = await owner.post(`/api/rule-profiles/${copy.profile.id}/versions`).send({ profile: edited, reason: 'again', basedOnVersion: 1 });
    expect(stale.status).toBe(409);
  });

  test('a bad value answers 400 naming the field', async () => {
    const copy = (await owner.post('/api/rule-profiles').send({ basedOnId: 'us-federal-2025-01', name: 'Bad edit' })).body as RuleProfileDetail;
    const bad = { ...copy.profile, holdingPolicy: { value: { kind: 'custom', customLimitMinutes: null }, source: copy.profile.holdingPolicy.source } };
    const res = await owner.post(`/api/rule-profiles/${copy.profile.id}/versions`).send({ profile: bad, reason: 'x', basedOnVersion: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors['profile.holdingPolicy.value.customLimitMinutes']).toEqual(['Enter the time limit in minutes']);
  });

  test('bakers and helpers may not copy or edit; shipped profiles cannot be edited; another business cannot see a copy', async () => {
    expect((await baker.post('/api/rule-profiles').send({ basedOnId: 'us-tx-2025-09', name: 'x' })).status).toBe(403);
    expect((await helper.post('/api/rule-profiles').send({ basedOnId: 'us-tx-2025-09', name: 'x' })).status).toBe(403);
    const copy = (await owner.post('/api/rule-profiles').send({ basedOnId: 'us-tx-2025-09', name: 'Private copy' })).body as RuleProfileDetail;
    expect((await baker.post(`/api/rule-profiles/${copy.profile.id}/versions`).send({ profile: copy.profile, reason: 'x', basedOnVersion: 1 })).status).toBe(403);
    const shipped = (await owner.get('/api/rule-profiles/us-tx-2025-09')).body.profile;
    expect((await owner.post('/api/rule-profiles/us-tx-2025-09/versions').send({ profile: shipped, reason: 'x', basedOnVersion: 1 })).status).toBe(400);
    const other = await businessWithAgents(t);
    expect((await other.owner.get(`/api/rule-profiles/${copy.profile.id}`)).status).toBe(404);
    expect((await other.owner.post(`/api/rule-profiles/${copy.profile.id}/versions`).send({ profile: copy.profile, reason: 'x', basedOnVersion: 1 })).status).toBe(404);
    expect((await other.owner.get('/api/rule-profiles')).body.profiles.some((p: RuleProfileSummary) => p.id === copy.profile.id)).toBe(false);
    expect((await other.owner.patch('/api/business').send({ ruleProfileId: copy.profile.id })).status).toBe(400);
  });
});
