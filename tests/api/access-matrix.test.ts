import { beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents, enrolledDeviceAgent, signedInAgent, type TestBusiness } from '../support/agents';
import { listRoutes, type RouteEntry } from '../support/routes';

// Authorization matrix as data (OWASP Authorization Testing Automation cheat sheet): the route table
// must equal docs/access-matrix.json, and every route × role is called to check the declared access.
const MATRIX_FILE = 'docs/access-matrix.json';
const AUDIENCES = ['owner', 'baker', 'helper', 'device', 'inspector', 'public'];
const matrix = JSON.parse(fs.readFileSync(MATRIX_FILE, 'utf8')) as Record<string, string[]>;

const t = makeTestApp();
const routes = listRoutes(t.app);
const line = (r: RouteEntry) => `  ${JSON.stringify(r.key)}: ${JSON.stringify(r.access ?? ['owner'])},`;

describe('route table', () => {
  test('every route starts with allow(...)', () => {
    const missing = routes.filter((r) => !r.access).map((r) => r.key);
    expect(missing, `These routes do not start with allow(...) from server/middleware/access.ts; make it the first handler:\n${missing.join('\n')}`).toEqual([]);
  });

  test(`every route is listed in ${MATRIX_FILE} with the audience it declares`, () => {
    const unlisted = routes.filter((r) => !(r.key in matrix));
    expect(unlisted.map((r) => r.key), `Add these lines to ${MATRIX_FILE}:\n${unlisted.map(line).join('\n')}`).toEqual([]);
    const differing = routes.filter((r) => r.key in matrix && [...matrix[r.key]!].sort().join() !== [...(r.access ?? [])].sort().join());
    expect(differing.map((r) => r.key), `The audience in ${MATRIX_FILE} differs from the route's allow(...); make the line read:\n${differing.map(line).join('\n')}`).toEqual([]);
  });

  test(`${MATRIX_FILE} lists no route that does not exist`, () => {
    const keys = new Set(routes.map((r) => r.key));
    const stale = Object.keys(matrix).filter((k) => !keys.has(k));
    expect(stale, `Remove these lines from ${MATRIX_FILE} (no such route), or fix the method/path spelling:\n${stale.join('\n')}`).toEqual([]);
  });

  test('audiences are only the known ones', () => {
    const bad = Object.entries(matrix).filter(([, a]) => !Array.isArray(a) || a.length === 0 || a.some((x) => !AUDIENCES.includes(x)));
    expect(bad.map(([k]) => k), `Each line needs a non-empty list drawn from ${AUDIENCES.join(', ')}`).toEqual([]);
  });
});

type Caller = 'owner' | 'baker' | 'helper' | 'device' | 'anonymous';
const CALLERS: Caller[] = ['owner', 'baker', 'helper', 'device', 'anonymous'];
const DUMMY_ID = '00000000-0000-4000-8000-000000000000';

describe('every route × caller', () => {
  let business: TestBusiness;
  const agents = {} as Record<Caller, ApiAgent>;

  async function connect(who: Caller) {
    if (who === 'anonymous') {
      agents.anonymous = new ApiAgent(t.app);
      await agents.anonymous.refreshCsrf();
    } else if (who === 'device') {
      // Its own owner session, so re-enrolling never races the owner caller's requests.
      agents.device = (await enrolledDeviceAgent(t, await signedInAgent(t, business, 'owner'))).agent;
    } else {
      agents[who] = await signedInAgent(t, business, who);
    }
  }

  beforeAll(async () => {
    const b = await businessWithAgents(t);
    business = b.business;
    for (const who of CALLERS) await connect(who);
  });

  test('denied callers get 401 (anonymous) or 403 (signed in); allowed callers get through', async () => {
    const failures: string[] = [];
    for (const route of routes) {
      // An unlisted route already fails the route-table test above.
      if (!(route.key in matrix)) continue;
      const audience = matrix[route.key]!;
      const url = route.path.replace(/:[A-Za-z]+/g, DUMMY_ID);
      // Callers are independent sessions: check them side by side.
      await Promise.all(CALLERS.map(async (who) => {
        const agent = agents[who];
        const method = route.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
        const req = agent[method](url);
        const res = method === 'get' ? await req : await req.send({});
        const allowed = audience.includes('public') || audience.includes(who);
        const ok = allowed ? res.status !== 401 && res.status !== 403 : res.status === (who === 'anonymous' ? 401 : 403);
        if (!ok) failures.push(`${route.key} as ${who}: got ${res.status}, expected ${allowed ? 'not 401/403' : who === 'anonymous' ? 401 : 403}`);
        // A route such as sign-out may end the caller's session; start a new one for the next route.
        const after = await agent.get('/api/auth/session');
        const expectedKind = who === 'anonymous' ? 'anonymous' : who === 'device' ? 'device' : 'member';
        if (after.body.kind !== expectedKind) await connect(who);
        else agents[who].csrfToken = after.body.csrfToken;
      }));
    }
    expect(failures).toEqual([]);
  }, 180_000);
});
