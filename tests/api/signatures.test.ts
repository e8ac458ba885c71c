import { describe, expect, test } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { ApiAgent, TEST_PASSWORD, businessWithAgents, enrolledDeviceAgent, type TestBusiness } from '../support/agents';
import { testDb, testPool, uniqueSuffix } from '../support/db';
import { CHLORINE_PASS, cleaningSetup, completedRun } from '../support/cleaning';
import { hashPassword } from '../../server/features/auth/passwords';
import { memberships, users } from '../../server/db/schema/auth';
import { cleaningSignatures } from '../../server/db/schema/cleaning';
import { recordEvents } from '../../server/db/schema/record-events';
import { listCleaningRunsForRange } from '../../server/features/cleaning/cleaning.service';

// Electronic signatures on the 21 CFR Part 11 model: §11.50 (printed name, date and time, meaning),
// §11.70 (bound to the record's content), §11.200 (the signer's own password, asked again).
const t = makeTestApp();
// Its own app, with sign-in's failure limit turned down to 3 (it also limits signing passwords).
const strict = makeTestApp({ config: { signInLimitPerAccount: 3 } });

/** A second helper in the same business, signed in. */
async function secondHelper(business: TestBusiness) {
  const email = `helper2-${uniqueSuffix()}@test.invalid`;
  const [user] = await t.db.insert(users).values({ email, displayName: 'Second Helper', passwordHash: await hashPassword('another long passphrase', t.config.hashParams) }).returning();
  await t.db.insert(memberships).values({ businessId: business.businessId, userId: user!.id, role: 'helper' });
  const agent = new ApiAgent(t.app);
  expect((await agent.signIn(email, 'another long passphrase')).status).toBe(200);
  return { agent, userId: user!.id, password: 'another long passphrase' };
}

const signaturesOf = (runId: string) => t.db.select().from(cleaningSignatures).where(eq(cleaningSignatures.runId, runId));

describe('signing a cleaning run', () => {
  test('a wrong password signs nothing (403) and the attempt is journalled; the right one signs with name, time with offset and meaning', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = await completedRun(helper, templateId);
    const wrong = await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: 'not my password at all' });
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.fieldErrors.password).toEqual(['That password is not right']);
    expect(await signaturesOf(id)).toEqual([]);
    const refused = await t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, business.businessId), eq(recordEvents.entityId, id), eq(recordEvents.action, 'sign_refused')));
    expect(refused).toHaveLength(1);
    expect((await helper.post(`/api/cleaning-runs/${id}/signatures`).send({})).status).toBe(400);

    const signed = await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD, version: 1 });
    expect(signed.status).toBe(201);
    const sig = signed.body.versions[0].signature;
    expect(sig).toMatchObject({
      printedName: business.members.helper.displayName, signerUserId: business.members.helper.userId, meaning: 'Cleaned and sanitised',
      version: 1, validity: 'valid', validityText: 'Signature valid', deviceName: null,
    });
    // Test businesses are in America/Chicago: offset −05:00 or −06:00.
    expect(sig.signedAtLocal).toMatch(/^\d{4}-\d\d-\d\d \d\d:\d\d \u22120[56]:00$/);
    expect(sig.signedAtIso).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d-0[56]:00$/);
    expect(sig.recordHash).toMatch(/^[0-9a-f]{64}$/);
    expect((await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD })).status).toBe(409);
  });

  test('a helper cannot produce a signature naming another user', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const other = await secondHelper(business);
    const { templateId } = await cleaningSetup(owner);
    const othersRun = await completedRun(other.agent, templateId);
    // Naming the other helper, even with their real password, from my session: refused.
    const asOther = await helper.post(`/api/cleaning-runs/${othersRun}/signatures`).send({ password: other.password, signerUserId: other.userId });
    expect(asOther.status).toBe(403);
    // Signing their run as myself: I did none of its steps, so "Cleaned and sanitised" is not mine to sign.
    const asMe = await helper.post(`/api/cleaning-runs/${othersRun}/signatures`).send({ password: TEST_PASSWORD });
    expect(asMe.status).toBe(403);
    // On a kitchen device: choosing the other helper needs the other helper's password, not mine.
    const { agent: tablet } = await enrolledDeviceAgent(t, owner);
    const tabletRun = await completedRun(tablet, templateId);
    const wrongPerson = await tablet.post(`/api/cleaning-runs/${tabletRun}/signatures`).send({ password: TEST_PASSWORD, signerUserId: other.userId });
    expect(wrongPerson.status).toBe(403);
    expect([...(await signaturesOf(othersRun)), ...(await signaturesOf(tabletRun))]).toEqual([]);
    // Only the person themself produces a signature with their name.
    const own = await other.agent.post(`/api/cleaning-runs/${othersRun}/signatures`).send({ password: other.password });
    expect(own.status).toBe(201);
    expect((await signaturesOf(othersRun)).map((s) => s.signerUserId)).toEqual([other.userId]);
    expect(business.members.helper.userId).not.toBe(other.userId);
  });

  test('a signed version refuses new steps; UPDATE, DELETE and TRUNCATE are refused by the database for the runtime role', async () => {
    const { owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = await completedRun(helper, templateId);
    await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD });
    const late = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's1' });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/correction/);
    for (const table of ['cleaning_signatures', 'cleaning_step_entries', 'cleaning_run_versions', 'cleaning_runs']) {
      const column = table === 'cleaning_runs' ? 'id' : 'run_id';
      await expect(t.pool.query(`update ${table} set updated_at = now() where ${column} = $1`, [id]), table).rejects.toThrow(/permission denied|append-only/);
      await expect(t.pool.query(`delete from ${table} where ${column} = $1`, [id]), table).rejects.toThrow(/permission denied|append-only/);
      await expect(t.pool.query(`truncate ${table} cascade`), table).rejects.toThrow(/permission denied|append-only/);
    }
    // Even the table owner is stopped by the trigger.
    const ownerPool = testPool('owner');
    await expect(ownerPool.query('update cleaning_signatures set printed_name = $1 where run_id = $2', ['Someone else', id])).rejects.toThrow(/append-only/);
    await ownerPool.end();
    expect((await signaturesOf(id))).toHaveLength(1);
  });

  test('a correction is a new version with a reason that must be signed again; the first signature stays valid', async () => {
    const { business, owner, baker, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = await completedRun(helper, templateId);
    expect((await baker.post(`/api/cleaning-runs/${id}/corrections`).send({ reason: 'Too early' })).status).toBe(409);
    await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD });
    const noReason = await baker.post(`/api/cleaning-runs/${id}/corrections`).send({});
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fieldErrors.reason).toBeDefined();
    const corrected = await baker.post(`/api/cleaning-runs/${id}/corrections`).send({
      reason: 'Test strip read 100 ppm, not 50; the 50 was typed by mistake',
      steps: [{ stepKey: 's3', sanitising: { ...CHLORINE_PASS, concentrationPpm: 100, contactSeconds: 10 }, note: 'Re-entered from the strip' }],
    });
    expect(corrected.status).toBe(201);
    const run = corrected.body;
    expect(run).toMatchObject({ currentVersion: 2, status: 'ready_to_sign' });
    expect(run.versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
    expect(run.versions[0].reason).toMatch(/typed by mistake/);
    expect(run.versions[0].signature).toBeNull();
    expect(run.versions[1].signature).toMatchObject({ validity: 'valid', version: 1 });
    // Version 2 holds the carried-over entries plus the corrected one; version 1 is unchanged.
    expect(run.versions[0].entries.filter((e: { carriedOver: boolean }) => e.carriedOver)).toHaveLength(4);
    expect(run.versions[1].entries).toHaveLength(4);
    expect(run.versions[1].entries.find((e: { stepKey: string }) => e.stepKey === 's3').sanitising.concentrationPpm).toBe('50.00');

    // The baker entered the corrected step, so the baker (or the helper) signs version 2.
    const resigned = await baker.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD, version: 2 });
    expect(resigned.status).toBe(201);
    expect(resigned.body.status).toBe('signed');
    expect(resigned.body.versions.map((v: { signature: { printedName: string } }) => v.signature.printedName)).toEqual([business.members.baker.displayName, business.members.helper.displayName]);
    const events = await t.db.select({ action: recordEvents.action, reason: recordEvents.reason }).from(recordEvents).where(and(eq(recordEvents.businessId, business.businessId), eq(recordEvents.entityId, id)));
    expect(events.filter((e) => e.action === 'correct')).toEqual([{ action: 'correct', reason: 'Test strip read 100 ppm, not 50; the 50 was typed by mistake' }]);
    expect(events.filter((e) => e.action === 'sign')).toHaveLength(2);
  });

  test('content altered underneath a signed version shows "signature invalid" in the API and the range export', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = await completedRun(helper, templateId);
    const signed = await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD });
    expect(signed.body.status).toBe('signed');
    // As the table owner with the trigger disabled: what someone with database superuser rights could do.
    const ownerPool = testPool('owner');
    const ownerDb = testDb(ownerPool);
    await ownerDb.transaction(async (tx) => {
      await tx.execute(sql`alter table cleaning_step_entries disable trigger append_only_row`);
      await tx.execute(sql`update cleaning_step_entries set concentration_ppm = 100 where run_id = ${id} and step_key = 's3'`);
      await tx.execute(sql`alter table cleaning_step_entries enable trigger append_only_row`);
    });
    await ownerPool.end();
    const after = await helper.get(`/api/cleaning-runs/${id}`);
    expect(after.body.status).toBe('signature_invalid');
    expect(after.body.versions[0].signature).toMatchObject({ validity: 'invalid', validityText: 'Signature invalid', printedName: business.members.helper.displayName, meaning: 'Cleaned and sanitised' });
    const today = after.body.runDate;
    const [exported] = await listCleaningRunsForRange(t.db, business.businessId, { from: today, to: today });
    expect(exported!.versions[0]!.signature!.validityText).toBe('Signature invalid');
  });

  test('wrong signing passwords are throttled per person signed for, as sign-in is: a tablet cannot guess a password', async () => {
    const { business, owner } = await businessWithAgents(strict);
    const { templateId } = await cleaningSetup(owner);
    const { agent: tablet } = await enrolledDeviceAgent(strict, owner);
    const id = await completedRun(tablet, templateId);
    const attempt = (password: string) => tablet.post(`/api/cleaning-runs/${id}/signatures`).send({ password, signerUserId: business.members.baker.userId });
    for (let i = 0; i < 3; i++) expect((await attempt(`guess number ${i}`)).status).toBe(403);
    const blocked = await attempt(TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(blocked.headers['retry-after']).toBeDefined();
    expect(await signaturesOf(id)).toEqual([]);
    // Another person's signature is not held up by the guesses.
    expect((await tablet.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD, signerUserId: business.members.helper.userId })).status).toBe(201);
  });
});
