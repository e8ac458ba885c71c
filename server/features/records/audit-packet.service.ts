import { randomUUID } from 'node:crypto';
import type { Writable } from 'node:stream';
import { eq, sql } from 'drizzle-orm';
import { stringify } from 'csv-stringify/sync';
import type { Db, DbOrTx } from '../../db/client';
import { businesses, type BusinessRow } from '../../db/schema/business';
import type { Actor } from '../../lib/actor';
import { notFound } from '../../lib/http-error';
import { appendRecordEvent, verifyBusinessChain } from './record-events.service';
import { loadRuleProfile } from '../rule-profiles/rule-profiles.service';
import { listDocuments } from '../documents/documents.service';
import { allergenMatrix } from '../recipes/recipes.service';
import { loadHoldingPeriods } from '../holding/holding.queries';
import { listCleaningRunsForRange } from '../cleaning/cleaning.service';
import { PacketZip, type PacketFile } from './packet-zip';
import { ReportPdf } from './report-pdf';
import { correctionsTable, packetTables, tableRows, useBusinessZone, type PacketScope, type PacketTable } from './audit-packet-tables';
import { escapeFormulaCell } from '../../../shared/domain/csv-safety';
import { formatZonedDateTime } from '../../../shared/domain/zoned-time';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import type { CleaningRun } from '../../../shared/contracts/cleaning';
import { SHIPPED_RULE_PROFILES } from '../../../shared/domain/rule-profiles';
import type { ChainVerdict } from '../../../shared/domain/record-chain';
import type { LabelText } from '../../../shared/domain/label-text';
import type { RuleProfile, RuleSource } from '../../../shared/contracts/rule-profiles';
import { DOCUMENT_KIND_LABELS } from '../../../shared/contracts/documents';
import { AuditPacketInputSchema, type AuditPacketInput, type AuditPacketManifest, type ChainResult } from '../../../shared/contracts/audit-packet';

export interface AuditPacketDeps {
  db: Db;
  now: () => Date;
}

export interface AuditPacketOptions {
  /** Pages per PDF part (a long section is split so no whole report sits in memory). */
  maxPagesPerPart?: number;
}

const CSV_CHUNK_ROWS = 500;

/** The file name offered for a packet's download. */
export const auditPacketFileName = (range: AuditPacketInput) => `audit-packet-${range.from}-to-${range.to}.zip`;

/** Writes one table as RFC 4180 CSV: UTF-8 without BOM, CRLF, header line, formula cells escaped (OWASP CSV Injection). */
export async function writeCsv(tx: DbOrTx, table: PacketTable, write: (chunk: string) => Promise<void>): Promise<number> {
  const opts = { record_delimiter: 'windows' as const };
  await write(stringify([table.columns.map(([h]) => h)], opts));
  let rows = 0;
  let chunk: string[][] = [];
  for await (const r of tableRows(tx, table)) {
    chunk.push(r.map(escapeFormulaCell));
    rows += 1;
    if (chunk.length >= CSV_CHUNK_ROWS) {
      await write(stringify(chunk, opts));
      chunk = [];
    }
  }
  if (chunk.length) await write(stringify(chunk, opts));
  return rows;
}

function chainResult(v: ChainVerdict): ChainResult {
  return v.ok
    ? { ok: true, count: v.count, headHash: v.headHash, headSeq: v.headSeq, firstBadSeq: null, problem: null }
    : { ok: false, count: v.count, headHash: v.headHash, headSeq: null, firstBadSeq: v.firstBadSeq, problem: v.problem };
}

const PROBLEM_TEXT: Record<NonNullable<ChainResult['problem']>, string> = {
  hash_mismatch: 'its content no longer matches its hash (it was changed after it was written)',
  broken_link: 'it does not point at the entry before it (an entry was removed, inserted or moved)',
  gap_in_sequence: 'an entry is missing from the sequence',
};

export function chainSentence(c: ChainResult): string {
  return c.ok
    ? `Verified: all ${c.count} record events from the first to number ${c.headSeq} link up and match their hashes.`
    : `NOT VERIFIED: record event number ${c.firstBadSeq} fails, because ${PROBLEM_TEXT[c.problem!]}. Entries from there on cannot be relied on as unchanged.`;
}

interface Ctx {
  tx: DbOrTx;
  db: Db;
  actor: Actor;
  business: BusinessRow;
  scope: PacketScope;
  exportedAt: Date;
  chain: ChainResult;
  zip: PacketZip;
  footer: string[];
  maxPagesPerPart: number;
}

function report(ctx: Ctx, stem: string, title: string): ReportPdf {
  return new ReportPdf({
    stem: `report/${stem}`, title, footer: ctx.footer, paper: ctx.business.country === 'US' ? 'letter' : 'a4', maxPagesPerPart: ctx.maxPagesPerPart, createdAt: ctx.exportedAt,
    onPart: async (part) => void (await ctx.zip.addBytes(part.name, part.bytes)),
  });
}

const at = (ctx: Ctx, d: Date | string | null | undefined) => (d ? formatZonedDateTime(new Date(d), ctx.scope.timeZone) : '\u2014');
const sourceText = (s: RuleSource) => [s.citation, s.checkedOn ? `checked ${s.checkedOn}` : 'not dated', s.verified ? 'verified' : 'not verified', s.url ?? ''].filter(Boolean).join(' \u00b7 ');

async function coverSection(ctx: Ctx): Promise<void> {
  const { business: b, scope } = ctx;
  const pdf = report(ctx, '01-cover', 'Audit packet');
  const loaded = await loadRuleProfile(ctx.tx, b.id, b.ruleProfileId);
  const profile: RuleProfile = loaded?.profile ?? SHIPPED_RULE_PROFILES[0]!;
  await pdf.section(`Food-safety records of ${b.name}`);
  await pdf.fields([
    ['Records from', `${scope.from} to ${scope.to} (calendar days in ${scope.timeZone})`],
    ['Exported', `${at(ctx, ctx.exportedAt)} by ${ctx.actor.name} (${ctx.actor.role})`],
    ['Address', [b.addressLine, b.city, b.region, b.postalCode, b.country].filter(Boolean).join(', ')],
    ['Business contact', [b.phone, b.email].filter(Boolean).join(' \u00b7 ')],
    ['Registration or permit', b.registrationNumber ? `${b.registrationNumber}${b.registrationAuthority ? ` (${b.registrationAuthority})` : ''}` : 'None recorded'],
    ['Record chain', chainSentence(ctx.chain)],
    ['Chain head hash', ctx.chain.headHash],
  ]);
  await pdf.caution(
    'Local rules come first',
    `${profile.caution} This packet is a copy of the records kept in Crumbtrail. It does not show that the business meets any law: ` +
      'the rules of your state, county or local health authority decide what is required, and their inspector has the final word. Ask them when in doubt.',
  );
  await pdf.heading('Rule profile in use');
  await pdf.fields([
    ['Profile', `${profile.name}${loaded?.version ? `, version ${loaded.version}` : ''}${profile.isCustom ? ' (the business\u2019s own copy)' : ''}`],
    ['Applies from', `${profile.effectiveFrom}${profile.effectiveTo ? ` until ${profile.effectiveTo}` : ' (still in force)'}`],
  ]);
  await pdf.table([{ header: 'Rule', width: 0.26 }, { header: 'Source, date checked, status', width: 0.74 }]);
  const sources: [string, RuleSource][] = [
    ['Profile in force', profile.effectiveSource], ['Allergen rules', profile.allergenRegime.source], ['Home-kitchen statement', profile.homeKitchenStatement.source],
    ['Time/temperature statement', profile.tcsStatement.source], ['Net quantity', profile.netQuantity.source], ['Yearly sales cap', profile.salesCap.source],
    ['Sales channels', profile.salesChannels.source], ['Foods needing time/temperature control', profile.allowsTcsFoods.source],
    ['Holding time', profile.holdingPolicy.source], ['Sanitisers', profile.sanitisers.source],
    ...profile.requiredLabelElements.map((e): [string, RuleSource] => [`Label: ${e.key}`, e.source]),
  ];
  for (const [rule, source] of sources) await pdf.row([rule, sourceText(source)], { color: source.verified ? 'ink' : 'bad' });
  pdf.endTable();

  await pdf.heading('Registration, permits and training certificates');
  const docs = (await listDocuments(ctx.db, ctx.actor, ctx.exportedAt)).documents.filter((d) => ['registration', 'permit', 'food_handler', 'food_manager'].includes(d.kind));
  if (!docs.length) await pdf.text('No registration, permit or training certificate is on file.', { color: 'muted' });
  else {
    await pdf.table([{ header: 'Kind', width: 0.18 }, { header: 'Title', width: 0.3 }, { header: 'Holder', width: 0.18 }, { header: 'Issued', width: 0.11 }, { header: 'Expires', width: 0.11 }, { header: 'Status', width: 0.12 }]);
    for (const d of docs) {
      const status = { no_expiry: 'no expiry', valid: 'valid', expiring_soon: 'expiring soon', expired: 'EXPIRED' }[d.expiryStatus];
      await pdf.row([DOCUMENT_KIND_LABELS[d.kind], d.current.title, d.holder?.displayName ?? '', d.current.issuedOn, d.current.expiresOn ?? '\u2014', status], { color: d.expiryStatus === 'expired' ? 'bad' : 'ink' });
    }
    pdf.endTable();
  }
  await pdf.heading('What is in this packet');
  await pdf.text(
    'The report/ folder holds this report, one PDF per section (long sections in parts). The csv/ folder holds the records as CSV files ' +
      '(RFC 4180, UTF-8, CRLF line ends; times in ISO 8601 with the business\u2019s offset; a cell that would start with = + - @ or a tab starts with an apostrophe so a spreadsheet shows it as text). ' +
      'manifest.json lists every file with its SHA-256. Customer names and contact details are never included: buyers appear only as an opaque reference.',
  );
  await pdf.finish();
}

async function batchSection(ctx: Ctx, batches: PacketTable): Promise<number> {
  const pdf = report(ctx, '02-batches', 'Batch register');
  await pdf.section('Batch register');
  await pdf.text(`Batches made from ${ctx.scope.from} to ${ctx.scope.to}, by day made. Inputs and state changes are in csv/batch-inputs.csv and csv/batch-state-changes.csv.`, { color: 'muted' });
  const i = indexOf(batches);
  await pdf.table([
    { header: 'Lot', width: 0.16 }, { header: 'Product (recipe version)', width: 0.26 }, { header: 'Made on', width: 0.11 }, { header: 'State', width: 0.1 },
    { header: 'Pieces / packages', width: 0.11 }, { header: 'Best by', width: 0.11 }, { header: 'Made by', width: 0.15 },
  ]);
  let n = 0;
  for await (const r of tableRows(ctx.tx, batches)) {
    n += 1;
    await pdf.row([r[i('lot_code')]!, `${r[i('product')]} (v${r[i('recipe_version')]})`, r[i('made_on')]!, r[i('state')]!.replace(/_/g, ' '),
      [r[i('quantity_pieces')] ?? '\u2014', r[i('quantity_packages')] ?? '\u2014'].join(' / '), r[i('best_by')] ?? '\u2014', r[i('made_by')] ?? '']);
  }
  pdf.endTable();
  if (!n) await pdf.text('No batches were made in this range.', { color: 'muted' });
  await pdf.finish();
  return n;
}

function indexOf(t: PacketTable) {
  return (header: string) => {
    const k = t.columns.findIndex(([h]) => h === header);
    if (k < 0) throw new Error(`No column ${header} in ${t.file}`);
    return k;
  };
}

const HOLDING_PAGE = 200;
const STATUS_TEXT: Record<string, string> = { running: 'running', within_limit: 'within limit', due_soon: 'due soon', over_limit: 'OVER LIMIT', completed: 'completed', not_permitted: 'not permitted' };

async function holdingSection(ctx: Ctx, periods: PacketTable): Promise<void> {
  const pdf = report(ctx, '03-holding', 'Holding periods');
  await pdf.section('Holding periods');
  await pdf.text('Time out of temperature control, with the limit in force when each period started, readings and corrective actions (FDA Food Code 2022 3-501.19 for time as a public health control).', { color: 'muted' });
  const id = indexOf(periods)('period_id');
  let ids: string[] = [];
  let n = 0;
  const flush = async () => {
    const loaded = await loadHoldingPeriods(ctx.tx, ctx.business.id, { periodIds: ids, limit: ids.length }, ctx.exportedAt);
    loaded.sort((a, b) => a.started.at.localeCompare(b.started.at));
    for (const p of loaded) {
      const over = p.evaluation.status === 'over_limit' || p.needsAction;
      await pdf.heading(`${p.lotCode} \u00b7 ${p.productName} \u00b7 ${p.label || p.kind.replace(/_/g, ' ')}`, 10);
      await pdf.fields([
        ['Policy and limit', `${p.policyName}${p.limitMinutes ? `, limit ${p.limitMinutes} min` : ', no time limit'} (from the ${p.policySource.replace('_', ' ')})`],
        ['Started', `${p.started.atLocal} by ${p.started.by}`],
        ['Stopped', p.stopped ? `${p.stopped.atLocal} by ${p.stopped.by}${p.stopped.note ? ` \u2014 ${p.stopped.note}` : ''}` : 'not stopped at export'],
        ['Result', `${STATUS_TEXT[p.evaluation.status] ?? p.evaluation.status}, ${Math.floor(p.evaluation.elapsedMs / 60_000)} min${p.needsAction ? ' \u2014 corrective action still missing' : ''}`],
        ['Readings', p.readings.length ? p.readings.map((x) => `${x.display} at ${x.atLocal} (${x.by})`).join('; ') : 'none'],
        ['Corrective actions', p.actions.length ? p.actions.map((a) => `${a.action}${a.reason ? `: ${a.reason}` : ''} at ${a.atLocal} (${a.by})`).join('; ') : 'none'],
      ]);
      if (over) await pdf.text('Over its limit: see the corrective action above.', { color: 'bad', size: 8.5 });
    }
    ids = [];
  };
  for await (const r of tableRows(ctx.tx, periods)) {
    ids.push(r[id]!);
    n += 1;
    if (ids.length >= HOLDING_PAGE) await flush();
  }
  if (ids.length) await flush();
  if (!n) await pdf.text('No holding periods started in this range.', { color: 'muted' });
  await pdf.finish();
}

const CLEANING_WINDOW_DAYS = 31;

/** Cleaning runs of the range a month at a time, so a long range never loads every run at once. */
async function* cleaningRuns(ctx: Ctx): AsyncGenerator<CleaningRun> {
  for (let from = ctx.scope.from; from <= ctx.scope.to; from = addCalendarDays(from, CLEANING_WINDOW_DAYS)) {
    const end = addCalendarDays(from, CLEANING_WINDOW_DAYS - 1);
    yield* await listCleaningRunsForRange(ctx.tx, ctx.business.id, { from, to: end < ctx.scope.to ? end : ctx.scope.to });
  }
}

const SIGNATURE_HEADER = ['run_id', 'run_date', 'checklist', 'version', 'printed_name', 'signer_role', 'meaning', 'signed_at', 'device', 'record_hash', 'validity', 'signature_id'];

/** Signatures with their validity (21 CFR 11.50 model: printed name, date and time, meaning), checked against the content now. */
async function writeSignaturesCsv(ctx: Ctx, write: (chunk: string) => Promise<void>): Promise<number> {
  const opts = { record_delimiter: 'windows' as const };
  await write(stringify([SIGNATURE_HEADER], opts));
  let n = 0;
  for await (const run of cleaningRuns(ctx)) {
    const rows = run.versions.filter((v) => v.signature).map((v) => {
      const sg = v.signature!;
      return [run.id, run.runDate, run.templateName, sg.version, sg.printedName, sg.signerRole, sg.meaning, sg.signedAtIso, sg.deviceName, sg.recordHash, sg.validity, sg.id].map(escapeFormulaCell);
    });
    n += rows.length;
    if (rows.length) await write(stringify(rows, opts));
  }
  return n;
}

async function cleaningSection(ctx: Ctx): Promise<void> {
  const pdf = report(ctx, '04-cleaning', 'Cleaning and sanitising');
  await pdf.section('Cleaning and sanitising');
  await pdf.text('Each run with its steps and its signature. A signature is valid only while the signed version\u2019s content still matches the hash taken at signing.', { color: 'muted' });
  let n = 0;
  for await (const run of cleaningRuns(ctx)) {
    n += 1;
    const current = run.versions[0];
    await pdf.heading(`${run.runDate} \u00b7 ${run.templateName}${run.batchLotCode ? ` \u00b7 lot ${run.batchLotCode}` : ''} \u00b7 ${run.status.replace(/_/g, ' ')}`, 10);
    await pdf.fields([['Started', `${run.started.atLocal} by ${run.started.by}`], ...(current?.notes ? [['Notes', current.notes] as const] : [])]);
    if (current?.entries.length) {
      await pdf.table([{ header: 'Step', width: 0.22 }, { header: 'Done', width: 0.2 }, { header: 'By', width: 0.16 }, { header: 'Check', width: 0.42 }]);
      const label = new Map(run.steps.map((st) => [st.key, st.label]));
      for (const e of current.entries) {
        const sn = e.sanitising;
        const check = sn ? `${sn.productName ?? sn.sanitiser.replace(/_/g, ' ')}${sn.concentrationPpm ? ` ${sn.concentrationPpm} ppm` : ''}${sn.waterTemperature ? `, ${sn.waterTemperature.display}` : ''}${sn.ph ? `, pH ${sn.ph}` : ''}: ${sn.passed ? 'passed' : `FAILED (${sn.problems.map((p) => p.message).join('; ')})`}` : '';
        const why = e.failureReason ? ` Reason: ${e.failureReason}` : '';
        await pdf.row([e.entryKind === 'explanation' ? `${label.get(e.stepKey) ?? e.stepKey} (explanation)` : label.get(e.stepKey) ?? e.stepKey, e.atLocal, e.by, `${check}${why}${e.note ? ` ${e.note}` : ''}`], { color: sn && !sn.passed && !e.failureReason ? 'bad' : 'ink' });
      }
      pdf.endTable();
    }
    for (const v of run.versions) {
      const sg = v.signature;
      if (!sg) continue;
      await pdf.text(`Signed (version ${v.version}): ${sg.printedName}, ${sg.signedAtLocal}, meaning \u201c${sg.meaning}\u201d${sg.deviceName ? `, on ${sg.deviceName}` : ''} \u2014 ${sg.validityText}`, { bold: true, size: 9, color: sg.validity === 'valid' ? 'ink' : 'bad' });
    }
    if (!run.versions.some((v) => v.signature)) await pdf.text('Not signed.', { color: 'muted', size: 9 });
    for (const v of run.versions.filter((x) => x.version > 1)) await pdf.text(`Version ${v.version} corrected ${v.createdAtLocal} by ${v.createdBy}: ${v.reason ?? ''}`, { size: 8.5 });
  }
  if (!n) await pdf.text('No cleaning runs in this range.', { color: 'muted' });
  await pdf.finish();
}

async function allergenSection(ctx: Ctx): Promise<void> {
  const pdf = report(ctx, '05-allergens', 'Allergen matrix');
  const m = await allergenMatrix(ctx.db, ctx.actor, {});
  await pdf.section('Allergen matrix');
  await pdf.text(`Sellable products as their labels read at export, against the ${m.regime.code} allergen list (rule set of ${m.regime.ruleSetDate}). X = declared.`, { color: 'muted' });
  if (!m.products.length) await pdf.text('No sellable products.', { color: 'muted' });
  else {
    const w = Math.min(0.08, 0.66 / Math.max(1, m.allergens.length));
    await pdf.table([{ header: 'Product', width: 1 - w * m.allergens.length }, ...m.allergens.map((a) => ({ header: a.name, width: w }))]);
    for (const p of m.products) await pdf.row([`${p.name} (v${p.version})`, ...p.cells.map((c) => (c.isPresent ? `X${c.kinds.length ? ` ${c.kinds.join(', ')}` : ''}` : ''))]);
    pdf.endTable();
    for (const p of m.products.filter((x) => x.warnings.length)) await pdf.text(`${p.name}: ${p.warnings.join(' ')}`, { color: 'bad', size: 8.5 });
  }
  await pdf.caution('Allergens', 'Check every label against the ingredients actually used. Undeclared allergens are a leading cause of food recalls; when unsure, ask your local health authority.');
  await pdf.finish();
}

async function labelSection(ctx: Ctx): Promise<void> {
  const pdf = report(ctx, '06-label-proofs', 'Label proofs');
  const s = ctx.scope;
  const res = await ctx.tx.execute(sql`select rv.name, rv.version, rv.label_snapshot as snap, count(b.id)::int as batches
    from recipe_versions rv join batches b on b.recipe_version_id = rv.id
    where b.business_id = ${s.businessId} and b.made_on between ${s.from}::date and ${s.to}::date
    group by rv.id order by rv.name, rv.version`);
  await pdf.section('Label proofs');
  await pdf.text('The label text of each recipe version used by a batch in this range, as saved with that version.', { color: 'muted' });
  const rows = res.rows as { name: string; version: number; snap: LabelText | null; batches: number }[];
  if (!rows.length) await pdf.text('No batches in this range, so no labels.', { color: 'muted' });
  for (const r of rows) {
    await pdf.heading(`${r.name}, version ${r.version} (${r.batches} batch${r.batches === 1 ? '' : 'es'})`, 10.5);
    const t = r.snap;
    if (!t) {
      await pdf.text('No label text was saved with this version.', { color: 'muted' });
      continue;
    }
    const a = t.allergenStatement;
    await pdf.fields([
      ['Ingredients', t.ingredientStatement.text],
      ['Allergens', a.containsLine ?? (a.allergens.length ? a.allergens.map((x) => x.name).join(', ') : 'none declared')],
      ...(a.crossContact ? [['Cross-contact', a.crossContact.text] as const] : []),
      ['Net quantity', t.netQuantity?.text ?? '\u2014'],
      ...t.statements.map((st) => [st.key === 'homeKitchenStatement' ? 'Home-kitchen statement' : 'Safe handling', st.text] as const),
    ]);
  }
  await pdf.finish();
}

async function correctionsSection(ctx: Ctx): Promise<void> {
  const pdf = report(ctx, '07-corrections', 'Corrections');
  const t = correctionsTable(ctx.scope);
  const i = indexOf(t);
  await pdf.section('Corrections');
  await pdf.text('A correction never overwrites a record: it is a new version with a reason, and the earlier version stays.', { color: 'muted' });
  await pdf.table([{ header: 'When', width: 0.2 }, { header: 'Record', width: 0.24 }, { header: 'Version', width: 0.08 }, { header: 'Reason', width: 0.33 }, { header: 'By', width: 0.15 }]);
  let n = 0;
  for await (const r of tableRows(ctx.tx, t)) {
    n += 1;
    await pdf.row([r[i('recorded_at')]!, `${r[i('record')]!.replace(/_/g, ' ')} ${r[i('reference')]}`, r[i('version')] ?? '\u2014', r[i('reason')] ?? '', r[i('by')] ?? '']);
  }
  pdf.endTable();
  if (!n) await pdf.text('No corrections in this range.', { color: 'muted' });
  await pdf.finish();
}

async function chainSection(ctx: Ctx): Promise<void> {
  const pdf = report(ctx, '08-chain', 'Record chain');
  await pdf.section('Record chain verification');
  await pdf.text(chainSentence(ctx.chain), { bold: true, color: ctx.chain.ok ? 'ink' : 'bad' });
  await pdf.fields([
    ['Entries checked', String(ctx.chain.count)],
    ['Head hash', ctx.chain.headHash],
    ['Head entry', ctx.chain.headSeq === null ? '\u2014' : String(ctx.chain.headSeq)],
  ]);
  await pdf.text(
    'Every change to a record writes an entry whose SHA-256 covers its content and the entry before it. Changing, removing or reordering an entry ' +
      'afterwards shows up here. It cannot make such changes impossible, so keep this head hash outside Crumbtrail (this printout, an e-mail): ' +
      'a later export whose chain does not contain this head hash means history was rewritten. csv/record-events.csv has every entry in the range with its hashes.',
  );
  await pdf.finish();
}

/**
 * Streams the audit packet for one business and date range to `out` as a zip: the PDF report in
 * parts, the CSV files and manifest.json with the SHA-256 of every file, the range, the export time
 * and the chain verification. All reads come from one read-only snapshot; the export itself is then
 * written as a record event. Works for an owner and for an inspector's link (pass the link's range).
 */
export async function streamAuditPacket(deps: AuditPacketDeps, actor: Actor, rawRange: AuditPacketInput, out: Writable, opts: AuditPacketOptions = {}): Promise<AuditPacketManifest> {
  const range = AuditPacketInputSchema.parse(rawRange);
  const exportedAt = deps.now();
  const zip = new PacketZip(out, exportedAt);
  try {
    const { business, chain } = await deps.db.transaction(
      async (tx) => {
        const [business] = await tx.select().from(businesses).where(eq(businesses.id, actor.businessId));
        if (!business) throw notFound('That business');
        await useBusinessZone(tx, business.timeZone);
        const chain = chainResult(await verifyBusinessChain(tx, business.id));
        const scope: PacketScope = { businessId: business.id, from: range.from, to: range.to, timeZone: business.timeZone };
        const footer = [
          `Exported ${formatZonedDateTime(exportedAt, business.timeZone)} \u00b7 ${business.name} \u00b7 records from ${range.from} to ${range.to}`,
          `Chain head ${chain.headHash} \u00b7 ${chain.ok ? `verified, ${chain.count} entries` : `NOT VERIFIED from entry ${chain.firstBadSeq}`}`,
        ];
        const ctx: Ctx = { tx, db: deps.db, actor, business, scope, exportedAt, chain, zip, footer, maxPagesPerPart: opts.maxPagesPerPart ?? 60 };
        const tables = packetTables(scope);
        await coverSection(ctx);
        await batchSection(ctx, tables.find((t) => t.file === 'batches.csv')!);
        await holdingSection(ctx, tables.find((t) => t.file === 'holding-periods.csv')!);
        await cleaningSection(ctx);
        await allergenSection(ctx);
        await labelSection(ctx);
        await correctionsSection(ctx);
        await chainSection(ctx);
        for (const t of tables) {
          await zip.addStreamed(`csv/${t.file}`, (write) => writeCsv(tx, t, write));
          if (t.file === 'cleaning-steps.csv') await zip.addStreamed('csv/cleaning-signatures.csv', (write) => writeSignaturesCsv(ctx, write));
        }
        return { business, chain };
      },
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
    const files = zip.files.map((f): PacketFile => ({ ...f }));
    const event = await deps.db.transaction((tx) =>
      appendRecordEvent(tx, actor, {
        entityType: 'audit_packet', entityId: randomUUID(), action: 'export',
        payload: { from: range.from, to: range.to, chain: { ok: chain.ok, headHash: chain.headHash, headSeq: chain.headSeq, firstBadSeq: chain.firstBadSeq }, files: files.map((f) => ({ name: f.name, sha256: f.sha256, bytes: f.bytes })) },
      }, exportedAt),
    );
    const manifest: AuditPacketManifest = {
      format: 'crumbtrail-audit-packet/1',
      business: { id: business.id, name: business.name, timeZone: business.timeZone },
      range: { from: range.from, to: range.to },
      exportedAt: exportedAt.toISOString(),
      exportedBy: { name: actor.name, role: actor.role },
      chain,
      exportEvent: { seq: event.seq, hash: event.hash },
      files,
      omitted: OMITTED,
    };
    await zip.addBytes('manifest.json', `${JSON.stringify(manifest, null, 2)}\n`);
    await zip.finalize();
    return manifest;
  } catch (err) {
    zip.abort();
    throw err;
  }
}

/** Sections whose records are not in this packet yet. */
const OMITTED: AuditPacketManifest['omitted'] = [];
