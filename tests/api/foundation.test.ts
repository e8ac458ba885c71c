import { describe, expect, test } from 'vitest';
import request from 'supertest';
import { eq, sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness, signedInAgent, ApiAgent } from '../support/agents';
import { testDb, testPool } from '../support/db';
import { recordEvents } from '../../server/db/schema/record-events';
import { appendRecordEvent, verifyBusinessChain } from '../../server/features/records/record-events.service';

const t = makeTestApp();

describe('GET /api/health', () => {
  test('when the database is up, then it reports app and database up', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ app: 'up', database: 'up' });
  });
});

describe('error shape', () => {
  test('an unknown API route answers 404 in the one error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: expect.any(String), requestId: expect.any(String) } });
  });
  test('malformed JSON answers 400, not 500', async () => {
    const agent = new ApiAgent(t.app);
    await agent.refreshCsrf();
    const res = await agent.post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
  });
  test('TRACE answers 405 and no X-Powered-By is sent', async () => {
    const res = await request(t.app).trace('/api/health');
    expect(res.status).toBe(405);
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

describe('POST /api/auth/sign-in', () => {
  test('when the password is right, then the session names the member and role', async () => {
    const b = await createTestBusiness(t);
    const agent = await signedInAgent(t, b, 'baker');
    const res = await agent.get('/api/auth/session');
    expect(res.body).toMatchObject({ kind: 'member', user: { role: 'baker', email: b.members.baker.email }, business: { id: b.businessId } });
  });
  test('a wrong password and an unknown e-mail get the same answer', async () => {
    const b = await createTestBusiness(t);
    const agent = new ApiAgent(t.app);
    await agent.refreshCsrf();
    const wrong = await agent.post('/api/auth/sign-in').send({ email: b.members.owner.email, password: 'not the password' });
    const unknown = await agent.post('/api/auth/sign-in').send({ email: `nobody-${Date.now()}@test.invalid`, password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });
  test('without the CSRF token a write is refused with 403', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 'a@b.test', password: 'x' });
    expect(res.status).toBe(403);
  });
});

describe('record_events', () => {
  test('the runtime role may not UPDATE, DELETE or TRUNCATE the journal', async () => {
    const b = await createTestBusiness(t);
    const [row] = await t.db.select().from(recordEvents).where(eq(recordEvents.businessId, b.businessId)).limit(1);
    await expect(t.db.execute(sql`update record_events set action = 'x' where id = ${row!.id}`)).rejects.toThrow();
    await expect(t.db.execute(sql`delete from record_events where id = ${row!.id}`)).rejects.toThrow();
    await expect(t.db.execute(sql`truncate record_events`)).rejects.toThrow();
  });

  test('a row changed directly in SQL makes verification name that entry', async () => {
    const b = await createTestBusiness(t);
    const actor = { businessId: b.businessId, userId: b.members.owner.userId, name: 'Owner', role: 'owner' as const };
    await t.db.transaction(async (tx) => {
      for (let i = 0; i < 3; i++) await appendRecordEvent(tx, actor, { entityType: 'note', entityId: `n${i}`, action: 'create', payload: { i } });
    });
    expect(await verifyBusinessChain(t.db, b.businessId)).toMatchObject({ ok: true, count: 5 });
    // As the table owner with the trigger disabled: what a superuser could do.
    const ownerPool = testPool('owner');
    const owner = testDb(ownerPool);
    await owner.transaction(async (tx) => {
      await tx.execute(sql`alter table record_events disable trigger append_only_row`);
      await tx.execute(sql`update record_events set payload = '{"i":42}'::jsonb where business_id = ${b.businessId} and seq = 4`);
      await tx.execute(sql`alter table record_events enable trigger append_only_row`);
    });
    await ownerPool.end();
    expect(await verifyBusinessChain(t.db, b.businessId)).toMatchObject({ ok: false, firstBadSeq: 4, problem: 'hash_mismatch' });
  });

  test('concurrent writers of one business get a gapless sequence', async () => {
    const b = await createTestBusiness(t);
    const actor = { businessId: b.businessId, userId: null, name: 'System', role: 'owner' as const };
    await Promise.all(Array.from({ length: 20 }, (_, i) => t.db.transaction((tx) => appendRecordEvent(tx, actor, { entityType: 'note', entityId: `c${i}`, action: 'create', payload: {} }))));
    const verdict = await verifyBusinessChain(t.db, b.businessId);
    expect(verdict).toMatchObject({ ok: true, count: 22, headSeq: 22 });
  });
});
