import { beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { eq } from 'drizzle-orm';
import { ApiAgent, createTestBusiness, signedInAgent, type TestBusiness } from '../support/agents';
import { users } from '../../server/db/schema/auth';
import { hashPassword } from '../../server/features/auth/passwords';
import { DEMO_ACCOUNTS } from '../../server/db/seed/demo-accounts';
import { DEMO_STEPS } from '../../server/db/seed/steps';
import type { SeedContext } from '../../server/db/seed/demo';
import type { Actor } from '../../server/lib/actor';

// Tenant isolation (OWASP IDOR / Authorization Testing cheat sheets): the owner of business A calls every
// route that takes an id with business B's real ids. Each answers 404 (or 403), no B data appears in any
// answer (lists included), and B's rows are byte-for-byte unchanged.
const matrix = JSON.parse(fs.readFileSync('docs/access-matrix.json', 'utf8')) as Record<string, string[]>;
const t = makeTestApp();

/** Where each route parameter's value comes from in B's data: `<first path segment after /api>:<param>` → SQL. */
const SOURCES: Record<string, string> = {
  'recipes:id': 'select id::text from recipes where business_id = $1',
  'recipes:version': "select '1'",
  'rule-profiles:id': 'select id::text from custom_rule_profiles where business_id = $1',
  'account:sessionId': "select sid from user_sessions where sess::text like '%' || $1 || '%'",
  'team:userId': 'select user_id::text from memberships where business_id = $1',
  'team:inviteId': 'select id::text from invites where business_id = $1',
  'devices:deviceId': 'select id::text from devices where business_id = $1',
  'documents:documentId': 'select id::text from documents where business_id = $1',
  'documents:versionId': 'select id::text from document_versions where business_id = $1',
  'calendar-feeds:feedId': 'select id::text from calendar_feeds where business_id = $1',
  'inspector-links:linkId': 'select id::text from inspector_links where business_id = $1',
  'batches:id': 'select id::text from batches where business_id = $1',
  'holding-periods:id': 'select id::text from holding_periods where business_id = $1',
  'ingredients:id': 'select id::text from ingredients where business_id = $1',
  'ingredients:fileId': 'select id::text from ingredient_label_files where business_id = $1',
  'supplier-lots:id': 'select id::text from supplier_lots where business_id = $1',
  'equipment:id': 'select id::text from equipment where business_id = $1',
  'sanitiser-products:id': 'select id::text from sanitiser_products where business_id = $1',
  'cleaning-templates:id': 'select id::text from cleaning_templates where business_id = $1',
  'cleaning-runs:id': 'select id::text from cleaning_runs where business_id = $1',
  'sales:id': 'select id::text from sales where business_id = $1',
  'customers:id': 'select id::text from customers where business_id = $1',
  'recalls:id': 'select id::text from recalls where business_id = $1',
  'recalls:customerId': 'select id::text from customers where business_id = $1',
};
// Bodies that pass validation, so the id lookup itself is what refuses.
const BODIES: Record<string, object> = {
  'POST /api/batches/:id/state': { toState: 'released', reason: 'Cross-business probe' },
  'POST /api/batches/:id/versions': { reason: 'Cross-business probe' },
  'PATCH /api/team/members/:userId': { role: 'helper' },
  'POST /api/team/members/:userId/disable': {},
  'POST /api/team/members/:userId/enable': {},
  'POST /api/ingredients/:id/archive': {},
  'POST /api/ingredients/:id/restore': {},
  'POST /api/ingredients/:id/verify': {},
  'POST /api/recipes/:id/archive': {},
};
const DUMMY = '00000000-0000-4000-8000-000000000000';
// Not tenant-scoped by the caller's business: public pages (their own codes) and inspector-only routes.
const isPublicOrInspector = (k: string) => matrix[k]!.every((a) => a === 'public' || a === 'inspector');

let a: TestBusiness;
let b: TestBusiness;
let ownerA: ApiAgent;
const bValues = new Map<string, string>();
let bMarkers: string[] = [];

async function digestsOfB(): Promise<Record<string, string>> {
  const tables = await t.pool.query<{ table_name: string }>(
    "select table_name from information_schema.columns where column_name = 'business_id' and table_schema = 'public' order by 1",
  );
  const out: Record<string, string> = {};
  for (const { table_name: name } of tables.rows) {
    const { rows } = await t.pool.query(`select count(*)::int as n, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as d from "${name}" x where business_id = $1`, [b.businessId]);
    out[name] = `${rows[0].n}:${rows[0].d}`;
  }
  return out;
}

beforeAll(async () => {
  a = await createTestBusiness(t);
  b = await createTestBusiness(t, { timeZone: 'America/Chicago', ruleProfileId: 'us-tx-2025-09' });
  // B gets the whole invented demo through the feature seed steps, so every kind of record exists
  // (steps that sign records use the demo people's passwords).
  for (const account of DEMO_ACCOUNTS) {
    await t.db.update(users).set({ passwordHash: await hashPassword(account.password, t.config.hashParams) }).where(eq(users.id, b.members[account.role].userId));
  }
  const actors = Object.fromEntries((['owner', 'baker', 'helper'] as const).map((role) => [role, {
    kind: 'member', businessId: b.businessId, userId: b.members[role].userId, name: b.members[role].displayName, role,
  } satisfies Actor])) as SeedContext['actors'];
  const ctx: SeedContext = { db: t.db, now: t.clock.now, businessId: b.businessId, actors, publicBaseUrl: 'http://127.0.0.1', uploadDir: fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-tenant-')), shared: new Map() };
  for (const step of DEMO_STEPS) await step.run(ctx);
  const ownerB = new ApiAgent(t.app);
  expect((await ownerB.signIn(b.members.owner.email, DEMO_ACCOUNTS.find((x) => x.role === 'owner')!.password)).status).toBe(200);
  expect((await ownerB.post('/api/team/invites').send({ email: `invitee-${b.businessId}@test.invalid`, role: 'baker' })).status).toBe(201);
  expect((await ownerB.post('/api/devices').send({ name: 'B tablet' })).status).toBe(201);
  ownerA = await signedInAgent(t, a, 'owner');

  for (const [key, query] of Object.entries(SOURCES)) {
    const param = key.startsWith('account:') ? b.members.owner.userId : b.businessId;
    const { rows } = await t.pool.query(query, query.includes('$1') ? [param] : []);
    if (rows[0]) bValues.set(key, String(Object.values(rows[0])[0]));
  }
  // Anything that would show B's data: its name, people, lot codes and every id it owns.
  const ids = await t.db.execute(sql`select id::text as v from batches where business_id = ${b.businessId} union select lot_code from batches where business_id = ${b.businessId} union select id::text from ingredients where business_id = ${b.businessId} union select id::text from recipes where business_id = ${b.businessId}`);
  bMarkers = [b.name, ...Object.values(b.members).flatMap((m) => [m.email, m.displayName, m.userId]), ...ids.rows.map((r) => String(r.v))];
}, 120_000);

describe("another business's ids", () => {
  const routes = Object.keys(matrix).filter((k) => k.includes('/:') && !isPublicOrInspector(k));

  test('every parameter of every such route has a source of B ids', () => {
    const missing = routes.flatMap((k) => (k.match(/:[A-Za-z]+/g) ?? []).map((p) => `${k.split(' ')[1]!.split('/')[2]}${p}`)).filter((s) => !(s in SOURCES));
    expect([...new Set(missing)], 'Add a line to SOURCES in this test for each').toEqual([]);
  });

  test('answer 404 or 403 on every route, leak nothing, and change nothing', async () => {
    const before = await digestsOfB();
    const failures: string[] = [];
    let withRealIds = 0;
    for (const key of routes) {
      const [method, route] = key.split(' ') as [string, string];
      const resource = route.split('/')[2]!;
      let real = false;
      const url = route.replace(/:([A-Za-z]+)/g, (_m, p: string) => {
        const v = bValues.get(`${resource}:${p}`);
        if (v && p !== 'version') real = true;
        return v ?? DUMMY;
      });
      if (real) withRealIds += 1;
      const verb = method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
      const res = verb === 'get' || verb === 'delete' ? await ownerA[verb](url) : await ownerA[verb](url).send(BODIES[key] ?? {});
      const text = `${JSON.stringify(res.body ?? '')}${res.text ?? ''}`;
      // A write whose body is refused first (400) still reached nothing of B's; reads must be 404/403.
      const allowed = verb === 'get' ? [403, 404] : [400, 403, 404, 422];
      if (!allowed.includes(res.status)) failures.push(`${key} with B ids: ${res.status}`);
      const leaked = bMarkers.filter((m) => text.includes(m));
      if (leaked.length) failures.push(`${key} leaked ${leaked.slice(0, 3).join(', ')}`);
    }
    // Lists and searches from A show none of B's records.
    for (const key of Object.keys(matrix).filter((k) => k.startsWith('GET /api/') && !k.includes('/:') && !isPublicOrInspector(k))) {
      const res = await ownerA.get(key.slice(4));
      const text = `${JSON.stringify(res.body ?? '')}${res.text ?? ''}`;
      const leaked = bMarkers.filter((m) => text.includes(m));
      if (leaked.length) failures.push(`${key} (list) leaked ${leaked.slice(0, 3).join(', ')}`);
    }
    expect(failures).toEqual([]);
    expect(withRealIds).toBeGreaterThan(routes.length * 0.6);
    expect(await digestsOfB()).toEqual(before);
  }, 120_000);
});
