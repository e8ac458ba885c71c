import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import fc from 'fast-check';
import crypto from 'node:crypto';
import { eq, inArray } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents } from '../support/agents';
import { startTestSmtp } from '../support/smtp';
import { createIngredient, createRecipeVersion, createSupplierLot } from '../support/factories';
import { recallChain } from '../support/sales-fixtures';
import { addCalendarDays } from '../../shared/domain/calendar-date';
import { batches, batchInputs, batchStateChanges, batchVersions } from '../../server/db/schema/batches';
import { mailOutbox } from '../../server/db/schema/mail';
import { createMailTransport, runMailOnce } from '../../server/features/mail/mail.service';
import { listRecallsForRange } from '../../server/features/trace/recalls.service';
import { pdfFonts, pdfText } from '../support/label-batches';

const t = makeTestApp();
let smtp: Awaited<ReturnType<typeof startTestSmtp>>;
beforeAll(async () => { smtp = await startTestSmtp(); });
afterAll(async () => { await smtp.close(); });
const today = () => t.clock.now.toISOString().slice(0, 10);
const sendMail = () => runMailOnce({ db: t.db, now: () => t.clock.now, transport: createMailTransport(smtp.url), from: 'Crumbtrail <no-reply@crumbtrail.invalid>' });

describe('trace on generated graphs', () => {
  test('forward from a lot finds every batch that used it, through in-between batches, and no other', async () => {
    const { business, owner } = await businessWithAgents(t);
    const ingredient = await createIngredient(t, business.businessId);
    const rv = await createRecipeVersion(t, business.businessId, { components: [{ kind: 'ingredient', ingredientId: ingredient.id, grams: '1' }] });
    let day = 0;
    // Batch i may use any lot and any earlier batch (a DAG, as batches can only use batches made before them).
    const graph = fc.integer({ min: 1, max: 4 }).chain((lotCount) => fc.integer({ min: 1, max: 9 }).chain((batchCount) => fc.tuple(
      fc.constant(lotCount),
      fc.array(fc.tuple(fc.subarray([...Array(lotCount).keys()]), fc.subarray([...Array(batchCount).keys()])), { minLength: batchCount, maxLength: batchCount }),
    )));
    await fc.assert(fc.asyncProperty(graph, async ([lotCount, uses]) => {
      const lots: { id: string }[] = [];
      for (let i = 0; i < lotCount; i += 1) lots.push(await createSupplierLot(t, business.businessId, { ingredientId: ingredient.id }));
      day += 1;
      const madeOn = addCalendarDays('2020-01-01', day); // one day per generated graph keeps day sequences unique
      const ids: string[] = [];
      for (const [i, [lotIdx, batchIdx]] of uses.entries()) {
        const [b] = await t.db.insert(batches).values({
          businessId: business.businessId, lotCode: `G-${crypto.randomUUID()}`, publicCode: crypto.randomBytes(18).toString('base64url'),
          recipeId: rv.recipeId, recipeVersionId: rv.id, madeOn, daySequence: i + 1, state: 'released',
        }).returning();
        const [v] = await t.db.insert(batchVersions).values({ businessId: business.businessId, batchId: b!.id, version: 1 }).returning();
        const rows = [
          ...lotIdx.map((l) => ({ ingredientId: ingredient.id, supplierLotId: lots[l]!.id })),
          ...batchIdx.filter((x) => x < i).map((x) => ({ subRecipeId: rv.recipeId, sourceBatchId: ids[x]! })),
        ];
        if (rows.length) await t.db.insert(batchInputs).values(rows.map((r) => ({ ...r, businessId: business.businessId, batchId: b!.id, batchVersionId: v!.id })));
        ids.push(b!.id);
      }
      // Reference: plain reachability over the generated uses.
      const reach = (lot: number) => {
        const hit = new Set<number>();
        for (let i = 0; i < uses.length; i += 1) {
          const [lotIdx, batchIdx] = uses[i]!;
          if (lotIdx.includes(lot) || batchIdx.some((x) => x < i && hit.has(x))) hit.add(i);
        }
        return [...hit].map((i) => ids[i]!).sort();
      };
      for (let l = 0; l < lotCount; l += 1) {
        const res = await owner.get('/api/trace').query({ supplierLotId: lots[l]!.id });
        expect(res.status).toBe(200);
        expect(res.body.batches.map((b: { id: string }) => b.id).sort()).toEqual(reach(l));
      }
    }), { numRuns: 20 });
  });
});

describe('trace and recall', () => {
  test('forward to customers and backward to the lot through the in-between batch', async () => {
    const { business, owner } = await businessWithAgents(t);
    const chain = await recallChain(t, business);
    const fwd = (await owner.get('/api/trace').query({ supplierLotId: chain.sprinklesLot.id })).body;
    expect(fwd.batches.map((b: { id: string }) => b.id).sort()).toEqual([chain.frosting.id, chain.productA.id, chain.productB.id].sort());
    expect(fwd.batches.find((b: { id: string }) => b.id === chain.productA.id).madeFromBatchIds).toEqual([chain.frosting.id]);
    const back = (await owner.get('/api/trace').query({ batchId: chain.productB.id })).body;
    expect(back.direction).toBe('backward');
    expect(back.supplierLots.map((l: { id: string }) => l.id)).toEqual([chain.sprinklesLot.id]);
    expect(back.batches.map((b: { id: string }) => b.id).sort()).toEqual([chain.frosting.id, chain.productB.id].sort());
    // From the ingredient: both lots, so the unrelated batch too.
    const ing = (await owner.get('/api/trace').query({ ingredientId: chain.sprinkles.id })).body;
    expect(ing.batches).toHaveLength(4);
    expect((await owner.get('/api/trace').query({ supplierLotId: chain.sprinklesLot.id, batchId: chain.productA.id })).status).toBe(400);
  });

  test('a recall moves the batches to recalled with history, changes their lot pages within seconds, and e-mails consenting customers once', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    const chain = await recallChain(t, business);
    const buy = (batchId: string, newCustomer?: Record<string, unknown>) => owner.post('/api/sales').send({ batchId, quantity: 4, unit: 'pieces', amountCents: 1200, channel: 'event', ...(newCustomer ? { newCustomer } : {}) });
    const emailYes = { name: 'Odile Marsh', email: `odile.${crypto.randomUUID().slice(0, 8)}@example.test`, recallConsent: true };
    const phoneOnly = { name: 'Bram Keller', phone: '555-0177', recallConsent: true };
    const noConsent = { name: 'Cass Rowan', email: `cass.${crypto.randomUUID().slice(0, 8)}@example.test`, recallConsent: false };
    const unrelatedBuyer = { name: 'Dev Lindqvist', email: `dev.${crypto.randomUUID().slice(0, 8)}@example.test`, recallConsent: true };
    await buy(chain.productA.id, emailYes);
    const second = await buy(chain.productB.id, phoneOnly);
    await buy(chain.productB.id, noConsent);
    await buy(chain.unrelated.id, unrelatedBuyer);

    const lotPage = async (code: string) => (await owner.agent.get(`/lot/${code}`)).text;
    const before = await lotPage(chain.productA.publicCode);
    expect(before).not.toContain('Recall');

    const body = {
      reason: 'Supplier recalled sprinkles lot for undeclared milk', publicNotice: 'These pops may contain milk, which is not on the label. Do not eat them if you are allergic to milk.',
      scope: { kind: 'supplier_lot', supplierLotId: chain.sprinklesLot.id },
    };
    expect((await owner.post('/api/recalls').send(body)).status, 'confirmation required').toBe(400);
    expect((await baker.post('/api/recalls').send({ ...body, confirmed: true })).status).toBe(403);
    const opened = await owner.post('/api/recalls').send({ ...body, confirmed: true });
    expect(opened.status).toBe(201);
    expect(opened.body.batches.map((b: { id: string }) => b.id).sort()).toEqual([chain.frosting.id, chain.productA.id, chain.productB.id].sort());

    const states = await t.db.select().from(batches).where(inArray(batches.id, [chain.frosting.id, chain.productA.id, chain.productB.id, chain.unrelated.id]));
    expect(Object.fromEntries(states.map((s) => [s.id, s.state]))).toEqual({ [chain.frosting.id]: 'recalled', [chain.productA.id]: 'recalled', [chain.productB.id]: 'recalled', [chain.unrelated.id]: 'released' });
    const history = await t.db.select().from(batchStateChanges).where(eq(batchStateChanges.batchId, chain.productA.id));
    expect(history.map((h) => h.toState)).toEqual(['in_progress', 'released', 'recalled']);

    // At once: opening the recall empties the lot page's short in-process cache (the page above was cached).
    const after = await lotPage(chain.productA.publicCode);
    expect(after).toContain('These pops may contain milk');
    expect(await lotPage(chain.unrelated.publicCode)).not.toContain('may contain milk');

    // A recalled batch can no longer be sold.
    expect((await buy(chain.productA.id)).status).toBe(409);

    const start = smtp.messages.length;
    await sendMail();
    const mails = smtp.messages.slice(start).filter((m) => m.subject?.startsWith('Recall notice'));
    expect(mails.map((m) => (Array.isArray(m.to) ? '' : m.to?.text))).toEqual([emailYes.email]);
    expect(mails[0]!.text).toContain(chain.productA.lotCode);
    expect(mails[0]!.text).toContain('may contain milk');
    expect(mails[0]!.text).toContain(`/lot/${chain.productA.publicCode}`);
    const outbox = await t.db.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, `recall:${opened.body.id}:${opened.body.customers.find((c: { contact: { name: string } }) => c.contact.name === 'Odile Marsh').customerId}`));
    expect(outbox).toHaveLength(1);

    let detail = (await owner.get(`/api/recalls/${opened.body.id}`)).body;
    const status = (name: string) => detail.customers.find((c: { contact: { name: string } }) => c.contact.name === name)?.status;
    expect(status('Odile Marsh')).toBe('email_sent');
    expect(status('Bram Keller')).toBe('to_call');
    expect(status('Cass Rowan')).toBe('no_consent');
    expect(status('Dev Lindqvist')).toBeUndefined();
    const bram = detail.customers.find((c: { contact: { name: string } }) => c.contact.name === 'Bram Keller');
    expect(second.body.customer.id).toBe(bram.customerId);
    const phoned = await owner.post(`/api/recalls/${opened.body.id}/customers/${bram.customerId}/phone`).send({ note: 'Called; they will bin the bag' });
    expect(phoned.status).toBe(200);
    detail = phoned.body;
    expect(status('Bram Keller')).toBe('told_by_phone');
    expect(detail.progress).toMatchObject({ customers: 3, told: 2, toCall: 0, noConsent: 1 });

    // The audit packet's view: no contact details at all.
    const packet = await listRecallsForRange(t.db, business.businessId, today(), today());
    expect(packet).toHaveLength(1);
    const packetText = JSON.stringify(packet);
    for (const s of [emailYes.email, emailYes.name, phoneOnly.phone, 'Bram Keller']) expect(packetText).not.toContain(s);
    expect(await listRecallsForRange(t.db, business.businessId, '2000-01-01', '2000-12-31')).toEqual([]);

    const closed = await owner.post(`/api/recalls/${opened.body.id}/close`).send({ note: 'All stock back or thrown away' });
    expect(closed.body.status).toBe('closed');
    expect((await owner.post(`/api/recalls/${opened.body.id}/close`).send({ note: 'Again' })).status).toBe(409);
  });

  test('the printable PDF report lists the tree and, for the owner only, the contacts; Lato is embedded', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const chain = await recallChain(t, business);
    await owner.post('/api/sales').send({ batchId: chain.productA.id, quantity: 1, unit: 'packages', amountCents: 600, channel: 'direct', newCustomer: { name: 'Zélie Ånström', email: 'zelie@example.test', recallConsent: true } });
    const get = (agent: typeof owner) => agent.get('/api/trace/report.pdf').query({ supplierLotId: chain.sprinklesLot.id }).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    const mine = await get(owner);
    expect(mine.status).toBe(200);
    expect(mine.headers['content-type']).toBe('application/pdf');
    const text = (await pdfText(mine.body)).join('\n');
    for (const b of [chain.frosting, chain.productA, chain.productB]) expect(text).toContain(b.lotCode);
    expect(text).not.toContain(chain.unrelated.lotCode);
    expect(text).toContain('Zélie Ånström, zelie@example.test');
    expect((await pdfFonts(mine.body)).every((f) => f.embedded)).toBe(true);
    const theirs = (await pdfText((await get(helper)).body)).join('\n');
    expect(theirs).toContain(chain.productA.lotCode);
    expect(theirs).not.toContain('zelie@example.test');
    expect(theirs).not.toContain('Zélie');
  });

  test('a recall of chosen batches also covers what was made from them; tenancy holds', async () => {
    const { business, owner } = await businessWithAgents(t);
    const other = await businessWithAgents(t);
    const chain = await recallChain(t, business);
    const body = { reason: 'Frosting left out too long', publicNotice: 'Please return these pops for a refund.', confirmed: true, scope: { kind: 'batches', batchIds: [chain.frosting.id] } };
    expect((await other.owner.post('/api/recalls').send(body)).status).toBe(404);
    const opened = await owner.post('/api/recalls').send(body);
    expect(opened.status).toBe(201);
    expect(opened.body.batches).toHaveLength(3);
    expect((await other.owner.get(`/api/recalls/${opened.body.id}`)).status).toBe(404);
    expect((await other.owner.get('/api/trace').query({ supplierLotId: chain.sprinklesLot.id })).status).toBe(404);
  });
});
