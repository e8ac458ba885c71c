import { beforeAll, describe, expect, test } from 'vitest';
import crypto from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import request from 'supertest';
import { makeTestApp } from '../support/app';
import { businessWithAgents, createTestBusiness, signedInAgent, type ApiAgent, type TestBusiness } from '../support/agents';
import { decodeQr, labelledBatch, pdfFonts, pdfText, renderPdfPage, setBusinessContact } from '../support/label-batches';
import { labelPrintRuns } from '../../server/db/schema/labels';
import { recordEvents } from '../../server/db/schema/record-events';
import { ingredientVersions } from '../../server/db/schema/ingredients';
import { changeBatchState } from '../../server/features/batches/batches.service';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();
const STATEMENT_TX = 'THIS PRODUCT WAS PRODUCED IN A PRIVATE RESIDENCE THAT IS NOT SUBJECT TO GOVERNMENTAL LICENSING OR INSPECTION.'; // Tex. HSC 437.0193(b)
const LETTER = { paper: 'letter', marginTopMm: 12.7, marginLeftMm: 12.7, marginRightMm: 12.7, marginBottomMm: 12.7, gutterXMm: 3, gutterYMm: 3 };
const ROLL = { ...LETTER, paper: 'roll' };
const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i;

let business: TestBusiness;
let owner: ApiAgent, baker: ApiAgent, helper: ApiAgent;
let ownerActor: Actor;

const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};
const print = (agent: ApiAgent, body: Record<string, unknown>) => agent.post('/api/labels/print-runs').send(body).buffer(true).parse(binary);

beforeAll(async () => {
  const b = await businessWithAgents(t);
  business = b.business;
  ({ owner, baker, helper } = b);
  await setBusinessContact(t, business.businessId, { ruleProfileId: 'us-tx-2025-09' });
  ownerActor = { kind: 'member', businessId: business.businessId, userId: business.members.owner.userId, name: business.members.owner.displayName, role: 'owner' };
});

describe('printing a label sheet', () => {
  test('30 labels of 2 × 2 in on Letter: 12 a page, every required element in the text, fonts embedded, one print run', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    const res = await print(baker, { batchId: batch.id, templateId: 'square-2in', count: 30, sheet: LETTER });
    expect(res.status, String(res.body)).toBe(201);
    expect(res.headers['content-type']).toMatch(/application\/pdf/);
    const bytes = res.body as Buffer;
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    expect(bytes.length).toBeLessThan(60_000);
    const pages = await pdfText(bytes);
    expect(pages).toHaveLength(3); // 3 × 4 per Letter page → 12 + 12 + 6
    const text = pages[0]!;
    expect(text).toContain('Pecan Praline Pops');
    expect(text).toContain('Ingredients: Wheat flour (wheat flour, niacin, reduced iron), Sugar, Butter (milk) (cream, salt), Eggs, Pecans');
    expect(text).toContain('Contains: Milk, Egg, Pecan, Wheat'); // 21 U.S.C. 343(w)(1)(B), (w)(2)
    // 4 × 28.35 g = 113.4 g: both units, rounded down (21 CFR 101.105, FPLA; NIST HB 130).
    expect(text).toContain('4 pieces, Net wt 4 oz (113 g)');
    expect(text).toContain(STATEMENT_TX);
    expect(text).toContain(`Lot ${batch.lotCode}`);
    expect(text).toMatch(/Made on \w{3} \d{1,2}, \d{4} · Best by \w{3} \d{1,2}, \d{4}/);
    expect(text.split('Pecan Praline Pops').length - 1).toBe(12);
    const fonts = await pdfFonts(bytes);
    expect(fonts.length).toBeGreaterThan(0);
    expect(fonts.every((f) => f.embedded && /TrueType/.test(f.type))).toBe(true);

    const runId = res.headers['x-print-run-id'];
    const [run] = await t.db.select().from(labelPrintRuns).where(eq(labelPrintRuns.id, runId));
    expect(run).toMatchObject({ batchId: batch.id, count: 30, pages: 3, templateId: 'square-2in', printedByName: business.members.baker.displayName });
    expect(run!.pdfSha256).toBe(crypto.createHash('sha256').update(bytes).digest('hex'));
    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, runId), eq(recordEvents.entityType, 'label_print_run')));
    expect(events.map((e) => e.action)).toEqual(['print']);
    const history = await owner.get(`/api/labels/print-runs?batchId=${batch.id}`);
    expect(history.body.map((r: { count: number }) => r.count)).toEqual([30]);
    // Append-only: the database refuses to change a print run.
    await expect(t.db.update(labelPrintRuns).set({ count: 1 }).where(eq(labelPrintRuns.id, runId))).rejects.toThrow();
  });

  test('the QR code decodes to the lot URL, which serves the lot page', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    const res = await print(owner, { batchId: batch.id, templateId: 'rect-3x2in', count: 1, sheet: ROLL });
    expect(res.status).toBe(201);
    const png = await renderPdfPage(res.body as Buffer, 1, 300);
    const url = decodeQr(png);
    expect(url).toBe(`${t.config.publicBaseUrl}/lot/${batch.publicCode}`);
    const page = await request(t.app).get(new URL(url!).pathname);
    expect(page.status).toBe(200);
    expect(page.text).toContain('Pecan Praline Pops');
  });

  test('preview: the proof page with the caution and one sheet, and no print run', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    const res = await owner.post('/api/labels/preview').send({ batchId: batch.id, templateId: 'rect-4x3in', count: 40, sheet: LETTER }).buffer(true).parse(binary);
    expect(res.status).toBe(200);
    const pages = await pdfText(res.body as Buffer);
    expect(pages).toHaveLength(2);
    expect(pages[0]).toContain('Print at 100 % ("actual size")');
    expect(pages[0]).toMatch(/local health authority/);
    expect(await t.db.select().from(labelPrintRuns).where(eq(labelPrintRuns.batchId, batch.id))).toEqual([]);
  });

  test('helpers cannot print; another business\u2019s batch is 404', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    expect((await helper.post('/api/labels/print-runs').send({ batchId: batch.id, templateId: 'square-2in', count: 1, sheet: LETTER })).status).toBe(403);
    const other = await createTestBusiness(t);
    const otherOwner = await signedInAgent(t, other, 'owner');
    expect((await otherOwner.post('/api/labels/print-runs').send({ batchId: batch.id, templateId: 'square-2in', count: 1, sheet: LETTER })).status).toBe(404);
    expect((await otherOwner.get(`/api/labels/check?batchId=${batch.id}&templateId=square-2in`)).status).toBe(404);
  });
});

describe('the label check', () => {
  test('a held batch of a business with no address or registration: 422 with every problem, nothing printed', async () => {
    const b = await createTestBusiness(t, { ruleProfileId: 'us-tx-2025-09' });
    const o = await signedInAgent(t, b, 'owner');
    const actor: Actor = { kind: 'member', businessId: b.businessId, userId: b.members.owner.userId, name: 'Owner', role: 'owner' };
    const { batch } = await labelledBatch(t, b.businessId, actor);
    await changeBatchState(t.db, actor, batch.id, { toState: 'held', reason: 'Checking the fridge log' }, t.clock.now);
    const check = await o.get(`/api/labels/check?batchId=${batch.id}&templateId=square-2in`);
    expect(check.status).toBe(200);
    expect(check.body.ok).toBe(false);
    expect(check.body.problems.map((p: { code: string }) => p.code)).toEqual(expect.arrayContaining(['batch_held', 'missing_businessNameRegistration']));
    const res = await o.post('/api/labels/print-runs').send({ batchId: batch.id, templateId: 'square-2in', count: 5, sheet: LETTER });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fieldErrors)).toEqual(expect.arrayContaining(['batch_held', 'missing_businessNameRegistration']));
    expect(await t.db.select().from(labelPrintRuns).where(eq(labelPrintRuns.batchId, batch.id))).toEqual([]);
  });

  test('made while the product assessment said "needs review": the owner confirms, the baker cannot', async () => {
    // Food Code 1-201.10(B) Table A: aw > 0.95 and pH > 5.6 needs a product assessment.
    const { batch } = await labelledBatch(t, business.businessId, ownerActor, { waterActivity: 0.96 });
    const body = { batchId: batch.id, templateId: 'rect-4x3in', count: 2, sheet: LETTER };
    const byBaker = await baker.post('/api/labels/print-runs').send({ ...body, confirmNeedsReview: true });
    expect(byBaker.status).toBe(422);
    expect(byBaker.body.error.fieldErrors).toHaveProperty('needs_review_owner');
    const unconfirmed = await owner.post('/api/labels/print-runs').send(body);
    expect(unconfirmed.body.error.fieldErrors).toHaveProperty('needs_review_unconfirmed');
    const ok = await print(owner, { ...body, confirmNeedsReview: true });
    expect(ok.status).toBe(201);
    const [run] = await t.db.select().from(labelPrintRuns).where(eq(labelPrintRuns.id, ok.headers['x-print-run-id']));
    expect(run!.confirmedNeedsReview).toBe(true);
    // A TCS product under Tex. HSC 437.0193(e) carries the safe-handling statement.
    expect((await pdfText(ok.body as Buffer))[0]).toContain('SAFE HANDLING INSTRUCTIONS: To prevent illness from bacteria, keep this food refrigerated or frozen until the food is prepared for consumption.');
  });

  test('a label sheet the label does not fit is a 400 naming the sheet', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    const res = await owner.post('/api/labels/print-runs').send({ batchId: batch.id, templateId: 'rect-4x3in', count: 1, sheet: { ...LETTER, marginLeftMm: 60, marginRightMm: 60 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors.sheet[0]).toMatch(/does not fit/);
  });
});

describe('the public lot page', () => {
  test('only public fields, under 14 kB, its own CSP, noindex, short public cache', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    const res = await request(t.app).get(`/lot/${batch.publicCode}`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    expect(Buffer.byteLength(res.text)).toBeLessThanOrEqual(14 * 1024);
    expect(res.text).toContain('Contains: Milk, Egg, Pecan, Wheat');
    expect(res.text).toContain('Made in a home kitchen that may also handle other allergens: ask the baker.');
    expect(res.text).toContain(batch.lotCode);
    expect(res.text).toContain('Juniper Test Bakes');
    expect(res.text).toContain('<meta name="robots" content="noindex,nofollow">');
    expect(res.text).not.toMatch(UUID);
    expect(res.text).not.toContain('<script');
    for (const m of Object.values(business.members)) expect(res.text).not.toContain(m.displayName);
    expect(res.text).not.toContain('9 Alder Row'); // street address is on the label, not the public page
    expect(res.headers['x-robots-tag']).toMatch(/noindex/);
    expect(res.headers['cache-control']).toBe('public, max-age=10');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("default-src 'none'");
    expect(csp).not.toContain('unsafe-inline');
    const css = /<style>([^<]*)<\/style>/.exec(res.text)![1]!;
    expect(csp).toContain(`'sha256-${crypto.createHash('sha256').update(css).digest('base64')}'`);
  });

  test('unknown or malformed codes get the 404 page in the same style', async () => {
    for (const code of ['AAAAAAAAAAAAAAAAAAAAAAAA', 'not-a-code', '%3Cscript%3E']) {
      const res = await request(t.app).get(`/lot/${code}`);
      expect(res.status).toBe(404);
      expect(res.text).toContain('We could not find this lot');
      expect(res.headers['content-security-policy']).toContain("default-src 'none'");
    }
  });

  test('a recall notice comes first, in a strong box', async () => {
    const { batch } = await labelledBatch(t, business.businessId, ownerActor);
    await request(t.app).get(`/lot/${batch.publicCode}`); // cached before the recall
    await changeBatchState(t.db, ownerActor, batch.id, { toState: 'recalled', reason: 'Supplier recalled the pecans' }, t.clock.now);
    t.clock.advance(5_001); // past the 5 s page cache
    const res = await request(t.app).get(`/lot/${batch.publicCode}`);
    expect(res.text).toContain('Recall: do not eat this product');
    expect(res.text.indexOf('Recall: do not eat')).toBeLessThan(res.text.indexOf('<h1>'));
    expect(res.text).not.toContain('Supplier recalled the pecans'); // the internal reason stays internal
    // A recalled batch cannot be labelled.
    expect((await owner.post('/api/labels/print-runs').send({ batchId: batch.id, templateId: 'square-2in', count: 1, sheet: LETTER })).body.error.fieldErrors).toHaveProperty('batch_recalled');
  });

  test('a correction notice when the label text of the lot\u2019s recipe changed after it was made', async () => {
    const { batch, ingredients } = await labelledBatch(t, business.businessId, ownerActor);
    const before = await request(t.app).get(`/lot/${batch.publicCode}`);
    expect(before.text).not.toContain('Corrected information');
    // The sugar's supplier label turns out to declare soy: a new ingredient version (append-only).
    const [v1] = await t.db.select().from(ingredientVersions).where(eq(ingredientVersions.ingredientId, ingredients.sugar.id));
    const { id: _id, createdAt: _c, updatedAt: _u, ...copy } = v1!;
    await t.db.insert(ingredientVersions).values({ ...copy, version: 2, allergens: [{ source: 'soy' }], reason: 'Supplier label lists soy lecithin' } as typeof ingredientVersions.$inferInsert);
    t.clock.advance(5_001); // past the 5 s page cache
    const res = await request(t.app).get(`/lot/${batch.publicCode}`);
    expect(res.text).toContain('Corrected information');
    expect(res.text).toContain('Contains: Milk, Egg, Pecan, Wheat, Soy');
    expect(res.text.indexOf('Corrected information')).toBeLessThan(res.text.indexOf('<h1>'));
  });
});
