import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { ownCluster } from '../support/own-cluster';
import { startChildServer, type ChildServer } from '../support/app-process';
import { signInOverHttp, writeHeaders, type HttpSession } from '../support/http-session';
import { createSimpleRecipe } from '../support/factories';
import { TEST_PASSWORD } from '../support/agents';
import type { TestApp } from '../support/app';
import { createDb, createPool } from '../../server/db/client';
import { signUp } from '../../server/features/auth/auth.service';
import { batches, batchVersions } from '../../server/db/schema/batches';
import { recordEvents } from '../../server/db/schema/record-events';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';

// Crash test for the app process (SIGKILL, as a software crash): every write the client saw
// acknowledged is there exactly once after a restart, and retrying unanswered writes with the same
// Idempotency-Key (draft-ietf-httpapi-idempotency-key-header) adds no duplicates.
const cluster = ownCluster('kill9-app', 54342);
let pool: ReturnType<typeof createPool>;
let db: ReturnType<typeof createDb>;
let server: ChildServer | undefined;
let businessId = '';
let recipeVersionId = '';
let lots: { ingredientId: string; supplierLotId: string }[] = [];
const email = 'owner-kill9@test.invalid';

beforeAll(async () => {
  cluster.start();
  await cluster.migrate();
  pool = createPool(cluster.runtimeUrl);
  db = createDb(pool);
  const owner = await signUp(db, { businessName: 'Kill Nine Bakes', displayName: 'Kill Nine Owner', email, password: TEST_PASSWORD });
  businessId = owner.businessId;
  const recipe = await createSimpleRecipe({ db } as TestApp, businessId, ['Flour', 'Sugar']);
  recipeVersionId = recipe.recipeVersion.id;
  lots = recipe.ingredients.map((i) => ({ ingredientId: i.ingredient.id, supplierLotId: i.lot.id }));
}, 120_000);

afterAll(async () => {
  await server?.kill('SIGKILL');
  await pool?.end().catch(() => undefined);
  cluster.destroy();
});

const start = () => startChildServer({ DATABASE_URL: cluster.runtimeUrl });

interface Write { key: string; body: object; batchId?: string }

async function post(session: HttpSession, w: Write): Promise<{ status: number; id?: string }> {
  const res = await fetch(`${session.baseUrl}/api/batches`, {
    method: 'POST',
    headers: writeHeaders(session, { 'idempotency-key': w.key }),
    body: JSON.stringify(w.body),
    signal: AbortSignal.timeout(20_000),
  });
  const body = (await res.json()) as { id?: string };
  return { status: res.status, id: body.id };
}

describe('when the app process is killed with SIGKILL during concurrent writes', () => {
  test('every acknowledged batch exists exactly once after restart and retries, and the chain verifies', async () => {
    const writes: Write[] = [];
    let counter = 0;
    const nextWrite = (round: number): Write => {
      counter += 1;
      // Spread over days so day sequences stay small; the same key always carries the same body.
      const day = new Date(Date.UTC(2025, 0, 1) + (counter % 300) * 86_400_000).toISOString().slice(0, 10);
      const w = { key: `kill9-${round}-${counter}-${Math.random().toString(36).slice(2)}`, body: { recipeVersionId, madeOn: day, lots } };
      writes.push(w);
      return w;
    };

    server = await start();
    let session = await signInOverHttp(server.url, email, TEST_PASSWORD);
    for (let round = 0; round < 2; round++) {
      const unanswered: Write[] = [];
      const refused: string[] = [];
      let stop = false;
      let acknowledged = 0;
      const worker = async () => {
        while (!stop) {
          const w = nextWrite(round);
          let res: { status: number; id?: string };
          try {
            res = await post(session, w);
          } catch {
            unanswered.push(w); // commit-unknown: the connection died before an answer
            return;
          }
          if (res.status !== 201) refused.push(`${w.key}: ${res.status}`);
          w.batchId = res.id;
          acknowledged += 1;
        }
      };
      const workers = Array.from({ length: 6 }, worker);
      // Kill at a random moment once writes are flowing (after 8 to 30 acknowledged in this round).
      const target = 8 + Math.floor(Math.random() * 22);
      const waitFrom = Date.now();
      while (acknowledged < target && Date.now() - waitFrom < 15_000) await new Promise((r) => setTimeout(r, 5));
      await server.kill('SIGKILL');
      stop = true;
      await Promise.all(workers);
      expect(refused).toEqual([]);
      expect(unanswered.length).toBeGreaterThan(0);

      server = await start();
      // The session lives in PostgreSQL, so the same cookie still signs the retries.
      session = { ...session, baseUrl: server.url };
      for (const w of unanswered) {
        const res = await post(session, w);
        expect(res.status).toBe(201);
        w.batchId = res.id;
      }
      // A retry of an acknowledged write answers the same batch.
      const acked = writes.find((w) => w.batchId && !unanswered.includes(w))!;
      expect((await post(session, acked)).id).toBe(acked.batchId);
    }

    const stored = await db.select({ id: batches.id }).from(batches).where(eq(batches.businessId, businessId));
    const ids = writes.map((w) => w.batchId);
    expect(ids.every(Boolean)).toBe(true);
    expect(new Set(ids).size).toBe(writes.length);
    expect(stored.map((r) => r.id).sort()).toEqual([...ids].sort());
    // No batch without its first version and its one create event (no partial transaction).
    const versions = await db.select({ n: sql<number>`count(*)::int` }).from(batchVersions).where(and(eq(batchVersions.businessId, businessId), eq(batchVersions.version, 1)));
    expect(versions[0]!.n).toBe(writes.length);
    const events = await db
      .select({ key: recordEvents.idempotencyKey })
      .from(recordEvents)
      .where(and(eq(recordEvents.businessId, businessId), eq(recordEvents.entityType, 'batch'), eq(recordEvents.action, 'create')));
    expect(events.map((e) => e.key).sort()).toEqual(writes.map((w) => w.key).sort());
    expect(await verifyBusinessChain(db, businessId)).toMatchObject({ ok: true });
  }, 90_000);
});
