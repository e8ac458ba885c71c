import request from 'supertest';
import type { Express } from 'express';
import { eq } from 'drizzle-orm';
import type { TestApp } from './app';
import { uniqueSuffix } from './db';
import { signUp } from '../../server/features/auth/auth.service';
import { hashPassword } from '../../server/features/auth/passwords';
import { memberships, users } from '../../server/db/schema/auth';
import { businesses } from '../../server/db/schema/business';
import type { Role } from '../../shared/contracts/auth';

export const TEST_PASSWORD = 'correct horse battery staple';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * A supertest agent that keeps the session cookie and sends the session's CSRF token on every
 * state-changing request, as the browser client does.
 */
export class ApiAgent {
  readonly agent: ReturnType<typeof request.agent>;
  csrfToken = '';
  constructor(readonly app: Express) {
    this.agent = request.agent(app);
  }
  async refreshCsrf(): Promise<string> {
    const res = await this.agent.get('/api/auth/session');
    this.csrfToken = res.body.csrfToken;
    return this.csrfToken;
  }
  private call(method: Method, url: string) {
    const req = this.agent[method](url);
    return method === 'get' ? req : req.set('X-CSRF-Token', this.csrfToken);
  }
  get(url: string) { return this.call('get', url); }
  post(url: string) { return this.call('post', url); }
  put(url: string) { return this.call('put', url); }
  patch(url: string) { return this.call('patch', url); }
  delete(url: string) { return this.call('delete', url); }
  async signIn(email: string, password = TEST_PASSWORD) {
    await this.refreshCsrf();
    const res = await this.post('/api/auth/sign-in').send({ email, password });
    if (res.status === 200) this.csrfToken = res.body.csrfToken;
    return res;
  }
}

export interface TestBusiness {
  businessId: string;
  name: string;
  members: Record<Role, { userId: string; email: string; displayName: string }>;
}

/** A new business with one owner, one baker and one helper, all with TEST_PASSWORD. */
export async function createTestBusiness(t: TestApp, overrides: { name?: string; timeZone?: string; ruleProfileId?: string } = {}): Promise<TestBusiness> {
  const suffix = uniqueSuffix();
  const name = overrides.name ?? `Test Bakery ${suffix}`;
  const owner = await signUp(t.db, { businessName: name, displayName: `Owner ${suffix}`, email: `owner-${suffix}@test.invalid`, password: TEST_PASSWORD }, t.config.hashParams);
  if (overrides.timeZone || overrides.ruleProfileId) {
    await t.db.update(businesses).set({ ...(overrides.timeZone ? { timeZone: overrides.timeZone } : {}), ...(overrides.ruleProfileId ? { ruleProfileId: overrides.ruleProfileId } : {}) }).where(eq(businesses.id, owner.businessId));
  }
  const passwordHash = await hashPassword(TEST_PASSWORD, t.config.hashParams);
  const members = { owner: { userId: owner.userId, email: `owner-${suffix}@test.invalid`, displayName: `Owner ${suffix}` } } as TestBusiness['members'];
  for (const role of ['baker', 'helper'] as const) {
    const email = `${role}-${suffix}@test.invalid`;
    const [user] = await t.db.insert(users).values({ email, displayName: `${role[0]!.toUpperCase()}${role.slice(1)} ${suffix}`, passwordHash }).returning();
    await t.db.insert(memberships).values({ businessId: owner.businessId, userId: user!.id, role });
    members[role] = { userId: user!.id, email, displayName: user!.displayName };
  }
  return { businessId: owner.businessId, name, members };
}

/** Signs in through the real route as the given role of the business. */
export async function signedInAgent(t: TestApp, business: TestBusiness, role: Role): Promise<ApiAgent> {
  const agent = new ApiAgent(t.app);
  const res = await agent.signIn(business.members[role].email);
  if (res.status !== 200) throw new Error(`sign-in failed for ${role}: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/** Business + agents for every role in one call. */
export async function businessWithAgents(t: TestApp) {
  const business = await createTestBusiness(t);
  const [owner, baker, helper] = await Promise.all((['owner', 'baker', 'helper'] as const).map((r) => signedInAgent(t, business, r)));
  return { business, owner: owner!, baker: baker!, helper: helper!, anonymous: new ApiAgent(t.app) };
}

/** A kitchen tablet enrolled by the given owner agent, signed in with its device session. */
export async function enrolledDeviceAgent(t: TestApp, owner: ApiAgent, name = 'Kitchen tablet'): Promise<{ agent: ApiAgent; deviceId: string }> {
  const created = await owner.post('/api/devices').send({ name });
  if (created.status !== 201) throw new Error(`device creation failed: ${created.status} ${JSON.stringify(created.body)}`);
  const agent = new ApiAgent(t.app);
  await agent.refreshCsrf();
  const res = await agent.post('/api/devices/enrol').send({ code: created.body.enrolmentCode });
  if (res.status !== 201) throw new Error(`enrolment failed: ${res.status} ${JSON.stringify(res.body)}`);
  agent.csrfToken = res.body.csrfToken;
  return { agent, deviceId: created.body.device.id };
}
