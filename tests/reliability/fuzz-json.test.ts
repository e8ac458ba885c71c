import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import fc from 'fast-check';
import { makeTestApp } from '../support/app';
import { createTestBusiness, TEST_PASSWORD } from '../support/agents';
import { signInOverHttp, writeHeaders, type HttpSession } from '../support/http-session';

// Malformed JSON bodies (wrong types, missing fields, huge strings, nested junk, prototype-pollution keys)
// on every POST/PUT/PATCH route in the access matrix: never a 5xx, and every 400 says what was wrong.
const matrix = JSON.parse(fs.readFileSync('docs/access-matrix.json', 'utf8')) as Record<string, string[]>;
// Sign-out last: it ends the session the other routes use.
const WRITES = Object.keys(matrix).filter((k) => /^(POST|PUT|PATCH) /.test(k)).sort((a, b) => Number(a.endsWith('/sign-out')) - Number(b.endsWith('/sign-out')));
const BODIES_PER_ROUTE = Number(process.env.FUZZ_RUNS ?? 200);
const SEED = Number(process.env.FUZZ_SEED ?? 20_240_601);
const DUMMY_ID = '00000000-0000-4000-8000-000000000000';

// Field names our contracts use, so values of the wrong type reach real fields; plus pollution keys.
const KEYS = ['name', 'labelName', 'email', 'password', 'displayName', 'role', 'reason', 'recipeVersionId', 'batchId', 'madeOn', 'lots',
  'components', 'count', 'templateId', 'sheet', 'toState', 'notes', 'amount', 'unit', 'quantity', 'celsius', 'readingC', 'code', 'expiresOn',
  'title', 'items', 'customerId', 'businessId', 'id', 'version', '__proto__', 'constructor', 'prototype'];
const junk = fc.oneof(
  { depthSize: 'small' },
  fc.anything({ maxDepth: 4, withBigInt: false, withDate: false, withMap: false, withSet: false, withTypedArray: false, withSparseArray: false }),
  fc.tuple(fc.string({ maxLength: 8 }), fc.integer({ min: 5_000, max: 50_000 })).map(([s, n]) => `${s}${'ẋ'.repeat(n)}`),
  fc.constantFrom(-1, 0, 1e308, -1e308, 2 ** 53 + 1, '', ' ', 'null', 'NaN', '1e999', '2025-02-30', '00000000-0000-0000-0000-000000000000', '<script>', "'; drop table batches; --"),
  fc.constant({ __proto__: null, constructor: { prototype: { polluted: true } } }),
);
const objectBody = fc.dictionary(fc.constantFrom(...KEYS), junk, { maxKeys: 6 }).map((o) => ({ kind: 'object' as const, text: JSON.stringify(o) }));
const pollution = fc.constantFrom(
  '{"__proto__":{"role":"owner","isAdmin":true}}',
  '{"constructor":{"prototype":{"businessId":"x"}}}',
  '{"__proto__":null,"name":{"__proto__":{"x":1}}}',
).map((text) => ({ kind: 'object' as const, text }));
const nonObject = fc.oneof(fc.string({ maxLength: 50 }), fc.integer(), fc.boolean(), fc.constant(null), fc.array(junk, { maxLength: 5 }))
  .map((v) => ({ kind: 'other' as const, text: JSON.stringify(v) }));
const brokenJson = fc.constantFrom('{', '{"a":', '{"a" 1}', '[1,]', 'undefined', '{"a":"\\u12"}', `{${'"k":1,'.repeat(5)}}`).map((text) => ({ kind: 'other' as const, text }));
const body = fc.oneof({ weight: 6, arbitrary: objectBody }, { weight: 1, arbitrary: pollution }, { weight: 2, arbitrary: nonObject }, { weight: 1, arbitrary: brokenJson });

const t = makeTestApp();
let baseUrl = '';
let session: HttpSession;
let ownerEmail = '';
let close: () => void;

beforeAll(async () => {
  const server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  close = () => server.close();
  const business = await createTestBusiness(t);
  ownerEmail = business.members.owner.email;
  session = await signInOverHttp(baseUrl, ownerEmail, TEST_PASSWORD);
});
afterAll(() => close?.());

describe('fuzzing every JSON write route', () => {
  test(`${WRITES.length} routes × ${BODIES_PER_ROUTE} malformed bodies: no 5xx, and every 400 names the problem`, async () => {
    expect(WRITES.length).toBeGreaterThan(20);
    const failures: string[] = [];
    const generated = Date.now();
    // One seeded sample for all routes (generating per route costs more than sending).
    const bodies = fc.sample(body, { numRuns: BODIES_PER_ROUTE, seed: SEED });
    if (process.env.FUZZ_VERBOSE) console.log('generated in', Date.now() - generated, 'ms');
    for (const key of WRITES) {
      const [method, path] = key.split(' ') as [string, string];
      const url = baseUrl + path.replace(/:[A-Za-z]+/g, DUMMY_ID);
      const routeStarted = Date.now();
      const statuses = new Map<number, number>();
      for (let i = 0; i < bodies.length; i += 16) {
        await Promise.all(bodies.slice(i, i + 16).map(async (b) => {
          const res = await fetch(url, { method, headers: writeHeaders(session), body: b.text, signal: AbortSignal.timeout(20_000) });
          const text = await res.text();
          statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
          const shown = `${key} ${b.text.slice(0, 160)} → ${res.status} ${text.slice(0, 200)}`;
          if (res.status >= 500) return void failures.push(shown);
          if (res.status !== 400) return;
          const error = (JSON.parse(text) as { error?: { message?: string; fieldErrors?: Record<string, string[]> } }).error;
          const named = error?.fieldErrors && Object.keys(error.fieldErrors).length > 0;
          if (b.kind === 'object' ? !named : !(named || error?.message)) failures.push(`400 without ${b.kind === 'object' ? 'fieldErrors' : 'a message'}: ${shown}`);
        }));
      }
      // Sign-out (or a password change) may end the session: start a new one for the next route.
      const check = await fetch(`${baseUrl}/api/auth/session`, { headers: { cookie: session.cookie } });
      if (((await check.json()) as { kind?: string }).kind !== 'member') session = await signInOverHttp(baseUrl, ownerEmail, TEST_PASSWORD);
      if (process.env.FUZZ_VERBOSE) console.log(key, Date.now() - routeStarted, 'ms', Object.fromEntries(statuses));
    }
    expect(failures.slice(0, 30), `${failures.length} failures (seed ${SEED})`).toEqual([]);
    // The app still answers normally afterwards.
    expect((await fetch(`${baseUrl}/api/health`)).status).toBe(200);
  }, 280_000);
});
