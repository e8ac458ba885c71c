import { beforeAll, describe, expect, test } from 'vitest';
import { createHash } from 'node:crypto';
import JSZip from 'jszip';
import { parse } from 'csv-parse/sync';
import { extractText, getDocumentProxy } from 'unpdf';
import { and, eq, sql } from 'drizzle-orm';
import type { Response } from 'superagent';
import { makeTestApp } from '../support/app';
import { businessWithAgents, createTestBusiness, TEST_PASSWORD, type ApiAgent, type TestBusiness } from '../support/agents';
import { testDb, testPool } from '../support/db';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { cleaningSetup, completedRun } from '../support/cleaning';
import { ownerActor } from '../support/sales-fixtures';
import { pdfFonts } from '../support/label-batches';
import { changeBatchState, correctBatch } from '../../server/features/batches/batches.service';
import { recordHoldingAction, saveWrittenProcedure, startHoldingPeriod, stopHoldingPeriod } from '../../server/features/holding/holding.service';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import { recordEvents } from '../../server/db/schema/record-events';
import { addCalendarDays } from '../../shared/domain/calendar-date';
import { businessLocalDate, formatIsoWithOffset } from '../../shared/domain/zoned-time';
import { AuditPacketManifestSchema, type AuditPacketManifest } from '../../shared/contracts/audit-packet';

const t = makeTestApp();
const TZ = 'America/Chicago';

// Values that CSV quoting (RFC 4180 §2.6–2.7) and formula escaping (OWASP CSV Injection) must survive.
const NOTES = '=HYPERLINK("http://evil.invalid","x"), with a comma\nand a "quoted" line — crème brûlée ½';
const REASON = '+1 more piece counted, "recount"';
const CUSTOMER = { name: 'Dana Whitfield', email: 'dana.whitfield@customer.invalid', phone: '+1 (555) 013-4477', recallConsent: true };

const binary = (res: Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

interface Packet {
  zip: JSZip;
  manifest: AuditPacketManifest;
  files: Map<string, Buffer>;
}

async function download(agent: ApiAgent, range: { from: string; to: string }): Promise<Packet> {
  const res = await agent.post('/api/audit-packets').send(range).buffer(true).parse(binary);
  expect(res.status, res.body.toString().slice(0, 300)).toBe(200);
  expect(res.headers['content-type']).toBe('application/zip');
  expect(res.headers['content-disposition']).toBe(`attachment; filename="audit-packet-${range.from}-to-${range.to}.zip"`);
  const zip = await JSZip.loadAsync(res.body as Buffer);
  const files = new Map<string, Buffer>();
  for (const name of Object.keys(zip.files)) files.set(name, await zip.file(name)!.async('nodebuffer'));
  const manifest = AuditPacketManifestSchema.parse(JSON.parse(files.get('manifest.json')!.toString('utf8')));
  return { zip, manifest, files };
}

function csv(p: Packet, name: string): string[][] {
  const text = p.files.get(`csv/${name}`)!.toString('utf8');
  expect(text.charCodeAt(0), 'no byte-order mark').not.toBe(0xfeff);
  expect(text.endsWith('\r\n')).toBe(true);
  // Strict parse: CRLF only, quotes must be well formed, every record the header's width.
  return parse(text, { record_delimiter: '\r\n', relax_quotes: false, relax_column_count: false, skip_empty_lines: false, bom: false }) as string[][];
}

function rowsOf(p: Packet, name: string): Record<string, string>[] {
  const [header, ...rows] = csv(p, name);
  return rows.map((r) => Object.fromEntries(header!.map((h, i) => [h, r[i]!])));
}

async function pdfText(bytes: Buffer): Promise<string> {
  const doc = await getDocumentProxy(new Uint8Array(bytes));
  const { text } = await extractText(doc, { mergePages: true });
  return text.replace(/\s+/g, ' ');
}

async function reportText(p: Packet): Promise<string> {
  const parts = [...p.files.keys()].filter((n) => n.startsWith('report/')).sort();
  return (await Promise.all(parts.map((n) => pdfText(p.files.get(n)!)))).join('\n');
}

describe('audit packet', () => {
  let b: TestBusiness;
  let owner: ApiAgent;
  let baker: ApiAgent;
  let helper: ApiAgent;
  let range: { from: string; to: string };
  let lotCode: string;
  let otherBatchId: string;
  let packet: Packet;

  beforeAll(async () => {
    ({ business: b, owner, baker, helper } = await businessWithAgents(t));
    const actor = ownerActor(b);
    const now = t.clock.now;
    const today = businessLocalDate(now, TZ);
    range = { from: addCalendarDays(today, -30), to: today };
    const { recipeVersion, ingredients } = await createSimpleRecipe(t, b.businessId);
    const batch = await createBatch(t, b.businessId, {
      recipeVersionId: recipeVersion.id, notes: NOTES, quantityPieces: 24,
      lots: ingredients.map((i) => ({ ingredientId: i.ingredient.id, supplierLotId: i.lot.id })),
    }, { userId: b.members.owner.userId });
    lotCode = batch.lotCode;
    await correctBatch(t.db, actor, batch.id, { quantityPieces: 25, reason: REASON }, now);
    await changeBatchState(t.db, actor, batch.id, { toState: 'released', reason: 'Packed and labelled' }, now);
    const sale = await owner.post('/api/sales').send({ batchId: batch.id, quantity: 6, unit: 'pieces', amountCents: 1800, channel: 'direct', newCustomer: CUSTOMER });
    expect(sale.status, JSON.stringify(sale.body)).toBe(201);
    await saveWrittenProcedure(t.db, actor, { title: 'Time as a control for cake pops', body: 'Cake pops on the market table are marked with the time they left the fridge and are discarded after four hours.' }, now);
    // TPHC 4 h starts at 41 °F or below (FDA Food Code 2022 3-501.19(B)(1)); 5 h out is over the limit.
    const period = await startHoldingPeriod(t.db, actor, { batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 41, unit: 'F' } }, undefined, new Date(now.getTime() - 300 * 60_000));
    await stopHoldingPeriod(t.db, actor, period.id, { note: 'Back in the fridge' }, undefined, now);
    await recordHoldingAction(t.db, actor, period.id, { action: 'discarded', reason: 'Past 4 hours on the market table' }, undefined, now);
    const { templateId } = await cleaningSetup(owner);
    const runId = await completedRun(helper, templateId);
    expect((await helper.post(`/api/cleaning-runs/${runId}/signatures`).send({ password: TEST_PASSWORD, version: 1 })).status).toBe(201);

    // Another business's batch must never appear.
    const other = await createTestBusiness(t);
    const otherRecipe = await createSimpleRecipe(t, other.businessId);
    const otherBatch = await createBatch(t, other.businessId, { recipeVersionId: otherRecipe.recipeVersion.id, notes: 'Other bakery only' });
    otherBatchId = otherBatch.id;

    packet = await download(owner, range);
  });

  test('holds the report parts, every CSV and a manifest whose hashes match the files', async () => {
    const names = [...packet.files.keys()].filter((n) => !n.endsWith('/'));
    for (const f of ['report/01-cover.pdf', 'report/02-batches.pdf', 'report/03-holding.pdf', 'report/04-cleaning.pdf', 'report/05-allergens.pdf', 'report/06-label-proofs.pdf', 'report/07-corrections.pdf', 'report/08-chain.pdf',
      'csv/batches.csv', 'csv/batch-inputs.csv', 'csv/batch-state-changes.csv', 'csv/holding-periods.csv', 'csv/holding-readings.csv', 'csv/holding-actions.csv',
      'csv/cleaning-runs.csv', 'csv/cleaning-steps.csv', 'csv/cleaning-signatures.csv', 'csv/sales.csv', 'csv/recalls.csv', 'csv/recall-batches.csv',
      'csv/recall-notifications.csv', 'csv/corrections.csv', 'csv/record-events.csv', 'manifest.json']) expect(names).toContain(f);
    const m = packet.manifest;
    expect(m.files.map((f) => f.name).sort()).toEqual(names.filter((n) => n !== 'manifest.json').sort());
    for (const f of m.files) {
      const bytes = packet.files.get(f.name)!;
      expect(f.bytes, f.name).toBe(bytes.length);
      expect(f.sha256, f.name).toBe(createHash('sha256').update(bytes).digest('hex'));
    }
    expect(m.range).toEqual(range);
    expect(m.business).toMatchObject({ id: b.businessId, timeZone: TZ });
    expect(Math.abs(Date.parse(m.exportedAt) - Date.now())).toBeLessThan(60_000);
    expect(m.exportedBy).toEqual({ name: b.members.owner.displayName, role: 'owner' });
    expect(m.files.find((f) => f.name === 'csv/batches.csv')!.rows).toBe(1);
  });

  test('CSV: strict RFC 4180 with CRLF, the exact values back, formula cells prefixed, ISO 8601 times with offset', () => {
    const [header] = csv(packet, 'batches.csv');
    expect(header!.slice(0, 4)).toEqual(['lot_code', 'product', 'recipe_version', 'made_on']);
    const [row] = rowsOf(packet, 'batches.csv');
    expect(row!.lot_code).toBe(lotCode);
    expect(row!.notes).toBe(`'${NOTES}`);
    expect(row!.quantity_pieces).toBe('25');
    expect(row!.record_version).toBe('2');
    expect(row!.recorded_at).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[+-]\d{2}:\d{2}$/);
    const corrections = rowsOf(packet, 'corrections.csv');
    expect(corrections.find((c) => c.record === 'batch')).toMatchObject({ reference: lotCode, version: '2', reason: `'${REASON}` });
    const events = rowsOf(packet, 'record-events.csv');
    // The offset printed is the business zone's at that instant (same answer as shared/domain/zoned-time).
    for (const e of events.slice(0, 5)) expect(e.occurred_at).toBe(formatIsoWithOffset(new Date(e.occurred_at_utc!), TZ));
    const seqs = events.map((e) => Number(e.seq));
    expect(seqs).toEqual([...seqs].sort((x, y) => x - y));
    const [period] = rowsOf(packet, 'holding-periods.csv');
    expect(period).toMatchObject({ lot_code: lotCode, policy: 'tphc_4h', limit_minutes: '240', stop_note: 'Back in the fridge', elapsed_minutes: '300' });
    expect(rowsOf(packet, 'holding-actions.csv')[0]).toMatchObject({ action: 'discarded', reason: 'Past 4 hours on the market table' });
    expect(rowsOf(packet, 'holding-readings.csv')[0]).toMatchObject({ value: '41.00', unit: 'F' });
    const [sig] = rowsOf(packet, 'cleaning-signatures.csv');
    expect(sig).toMatchObject({ printed_name: b.members.helper.displayName, validity: 'valid', meaning: 'Cleaned and sanitised' });
    expect(sig!.signed_at).toMatch(/[+-]\d{2}:\d{2}$/);
    const [sale] = rowsOf(packet, 'sales.csv');
    expect(sale).toMatchObject({ lot_code: lotCode, amount_cents: '1800', kind: 'sale' });
    expect(sale!.customer_ref).toMatch(/^[0-9a-f-]{36}$/);
  });

  test('no customer name, e-mail or phone anywhere in the zip', () => {
    for (const [name, bytes] of packet.files) {
      const text = bytes.toString('latin1');
      for (const needle of [CUSTOMER.email, CUSTOMER.phone, CUSTOMER.name, 'customer.invalid']) expect(text.includes(needle), `${needle} in ${name}`).toBe(false);
    }
  });

  test('the PDF report: sections, footer with export time, range and head hash, signatures, fonts embedded', async () => {
    const head = packet.manifest.chain.headHash;
    for (const [name, bytes] of packet.files) {
      if (!name.endsWith('.pdf')) continue;
      const text = await pdfText(bytes);
      expect(text, name).toContain(head);
      expect(text, name).toContain(`records from ${range.from} to ${range.to}`);
      // Every font embedded, the standard 14 included (veraPDF clause 6.2.11.4).
      const fonts = await pdfFonts(bytes);
      expect(fonts.length, name).toBeGreaterThan(0);
      for (const f of fonts) expect(f, name).toMatchObject({ name: expect.stringContaining('Lato'), embedded: true });
    }
    const all = await reportText(packet);
    expect(all).toContain(b.name);
    expect(all).toContain('Local rules come first');
    expect(all).toContain(lotCode);
    expect(all).toContain(REASON);
    expect(all).toContain('Past 4 hours on the market table');
    expect(all).toContain(`${b.members.helper.displayName}`);
    expect(all).toContain('Signature valid');
    expect(all).toContain('Cleaned and sanitised');
    expect(all).toMatch(/Verified: all \d+ record events/);
    expect(all).not.toContain('Other bakery only');
  });

  test('the export is a record event with the range, files and head hash', async () => {
    const [event] = await t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, b.businessId), eq(recordEvents.seq, packet.manifest.exportEvent.seq)));
    expect(event).toMatchObject({ entityType: 'audit_packet', action: 'export', actorName: b.members.owner.displayName, hash: packet.manifest.exportEvent.hash });
    const payload = event!.payload as { from: string; to: string; chain: { headHash: string }; files: { name: string; sha256: string }[] };
    expect(payload).toMatchObject({ from: range.from, to: range.to, chain: { headHash: packet.manifest.chain.headHash } });
    expect(payload.files.map((f) => f.sha256)).toEqual(packet.manifest.files.map((f) => f.sha256));
    // The chain head in the packet is the entry just before the export event.
    expect(packet.manifest.chain.headSeq).toBe(event!.seq - 1);
    expect(event!.prevHash).toBe(packet.manifest.chain.headHash);
  });

  test('another business\u2019s records are absent', () => {
    // Lot codes may repeat across businesses, so look for the other one's batch id and notes.
    for (const [name, bytes] of packet.files) {
      expect(bytes.toString('utf8').includes(otherBatchId), name).toBe(false);
      expect(bytes.toString('utf8').includes('Other bakery only'), name).toBe(false);
    }
  });

  test('only the owner: baker and helper 403, anonymous 401, nothing recorded', async () => {
    const before = await verifyBusinessChain(t.db, b.businessId);
    expect((await baker.post('/api/audit-packets').send(range)).status).toBe(403);
    expect((await helper.post('/api/audit-packets').send(range)).status).toBe(403);
    const anon = new (owner.constructor as typeof ApiAgent)(t.app);
    await anon.refreshCsrf();
    expect((await anon.post('/api/audit-packets').send(range)).status).toBe(401);
    expect(await verifyBusinessChain(t.db, b.businessId)).toEqual(before);
  });

  test('a bad range is a 400 with field errors, not a broken download', async () => {
    const res = await owner.post('/api/audit-packets').send({ from: range.to, to: range.from });
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: 'validation_failed', fieldErrors: { to: [expect.stringContaining('on or after')] } });
    expect(res.headers['content-disposition']).toBeUndefined();
    expect((await owner.post('/api/audit-packets').send({ from: '2020-01-01', to: '2026-01-01' })).status).toBe(400);
    expect((await owner.post('/api/audit-packets').send({ from: 'yesterday', to: range.to })).status).toBe(400);
  });

  test('intact chain: verified and the head equals the database head; tampered: names the first bad entry', async () => {
    const intact = await download(owner, range);
    const db = await verifyBusinessChain(t.db, b.businessId);
    expect(intact.manifest.chain).toMatchObject({ ok: true, problem: null });
    expect(db).toMatchObject({ ok: true, headSeq: intact.manifest.exportEvent.seq });
    expect(intact.manifest.chain.headSeq).toBe(intact.manifest.exportEvent.seq - 1);

    // As the table owner with the trigger disabled: what a superuser could do.
    const ownerPool = testPool('owner');
    const asOwner = testDb(ownerPool);
    await asOwner.transaction(async (tx) => {
      await tx.execute(sql`alter table record_events disable trigger append_only_row`);
      await tx.execute(sql`update record_events set payload = '{"forged":true}'::jsonb where business_id = ${b.businessId} and seq = 3`);
      await tx.execute(sql`alter table record_events enable trigger append_only_row`);
    });
    await ownerPool.end();
    const tampered = await download(owner, range);
    expect(tampered.manifest.chain).toMatchObject({ ok: false, firstBadSeq: 3, problem: 'hash_mismatch', headSeq: null });
    const text = await pdfText(tampered.files.get('report/08-chain.pdf')!);
    expect(text).toContain('NOT VERIFIED: record event number 3 fails');
    expect(text).toContain('NOT VERIFIED from entry 3');
  });
});
