import { createHash } from 'node:crypto';
import { and, asc, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { HttpError, badRequest, conflict, forbidden, notFound } from '../../lib/http-error';
import { appendRecordEvent } from '../records/record-events.service';
import { onceForIdempotencyKey } from '../records/idempotent-write';
import { verifyPassword } from '../auth/passwords';
import { memberships, users } from '../../db/schema/auth';
import { batches } from '../../db/schema/batches';
import { equipment } from '../../db/schema/cleaning';
import {
  cleaningRuns, cleaningRunVersions, cleaningSignatures, cleaningStepEntries, cleaningTemplates, sanitiserProducts,
  type CleaningRunRow, type CleaningStepEntryRow,
} from '../../db/schema/cleaning';
import { checkSanitiser, type SanitiserLabel } from '../../../shared/domain/sanitiser-checks';
import { cleaningDueForAll } from '../../../shared/domain/cleaning-due';
import { businessLocalDate, formatZonedDateTime } from '../../../shared/domain/zoned-time';
import {
  AddCleaningStepInputSchema, CLEANING_SIGNATURE_MEANING, CorrectCleaningRunInputSchema, SignCleaningRunInputSchema, StartCleaningRunInputSchema,
  type AddCleaningStepInput, type CleaningDueList, type CleaningRun, type CleaningRunList, type CleaningRunListQuery, type CleaningSignerList,
  type CorrectCleaningRunInput, type RecordStepInput, type SignCleaningRunInput, type StartCleaningRunInput,
} from '../../../shared/contracts/cleaning';
import { businessZone, cleaningVersionHash, loadCleaningRuns, loadRunRows, signingBlockers, stepStates } from './cleaning.queries';

const ENTITY = 'cleaning_run';

/** Idempotency-Key and request id of a write (IETF draft-ietf-httpapi-idempotency-key-header). */
export interface CleaningWriteOptions {
  idempotencyKey?: string;
  requestId?: string;
}

const requestHash = (operation: string, body: unknown) => createHash('sha256').update(JSON.stringify([operation, body ?? null])).digest('hex');

const onceForKey = (db: Db, actor: Actor, key: string | undefined, hash: string, write: () => Promise<string>) =>
  onceForIdempotencyKey(db, actor.businessId, key, ENTITY, hash, write);

const lockBusiness = (tx: DbOrTx, businessId: string) => tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${businessId}::text, 0))`);

async function oneRun(db: DbOrTx, businessId: string, id: string): Promise<CleaningRun> {
  const [run] = await loadCleaningRuns(db, businessId, { runIds: [id] });
  if (!run) throw notFound('That cleaning run');
  return run;
}

/** The run row and its current (highest) version, with that version's entries and signature. */
async function currentState(db: DbOrTx, businessId: string, id: string) {
  const [loaded] = await loadRunRows(db, businessId, { runIds: [id] });
  if (!loaded) throw notFound('That cleaning run');
  const version = loaded.versions.at(-1)!;
  const entries = loaded.entries.filter((e) => e.runVersionId === version.id);
  const signature = loaded.signatures.find((s) => s.runVersionId === version.id) ?? null;
  return { run: loaded.row, version, entries, signature };
}

const who = (actor: Actor) => ({ doneByUserId: actor.userId, doneByName: actor.name, doneByRole: String(actor.role) });

export async function listCleaningRuns(db: Db, actor: Actor, query: CleaningRunListQuery, now: Date): Promise<CleaningRunList> {
  const timeZone = await businessZone(db, actor.businessId);
  const today = businessLocalDate(now, timeZone);
  const runs = await loadCleaningRuns(db, actor.businessId, query.batchId ? { batchId: query.batchId, runDate: query.date } : { runDate: query.date ?? today });
  return { runs: runs.reverse(), serverNow: now.toISOString(), timeZone, today };
}

export async function getCleaningRun(db: Db, actor: Actor, id: string): Promise<CleaningRun> {
  return oneRun(db, actor.businessId, id);
}

/**
 * Every run whose date falls in [from, to] (business calendar dates), oldest first, each with its
 * versions, entries and signatures (validity checked now). For the audit packet and exports.
 */
export async function listCleaningRunsForRange(db: DbOrTx, businessId: string, range: { from: string; to: string }): Promise<CleaningRun[]> {
  return loadCleaningRuns(db, businessId, range);
}

/** Starts a run from a template (a copy of its steps is kept with the run), for the day or a batch. */
export async function startCleaningRun(db: Db, actor: Actor, raw: StartCleaningRunInput, opts: CleaningWriteOptions, now: Date): Promise<CleaningRun> {
  const input = StartCleaningRunInputSchema.parse(raw);
  const hash = requestHash('start', input);
  const id = await onceForKey(db, actor, opts.idempotencyKey, hash, async () => {
    const [template] = await db.select().from(cleaningTemplates).where(and(eq(cleaningTemplates.id, input.templateId), eq(cleaningTemplates.businessId, actor.businessId)));
    if (!template) throw new HttpError(404, 'not_found', 'That cleaning checklist does not exist.', { templateId: ['Choose a checklist of this bakery'] });
    if (template.archivedAt) throw conflict('That checklist is archived; choose another or restore it first.', { templateId: ['This checklist is archived'] });
    if (input.batchId) {
      const [batch] = await db.select({ id: batches.id }).from(batches).where(and(eq(batches.id, input.batchId), eq(batches.businessId, actor.businessId)));
      if (!batch) throw new HttpError(404, 'not_found', 'That batch does not exist.', { batchId: ['Choose a batch of this bakery'] });
    }
    const timeZone = await businessZone(db, actor.businessId);
    return db.transaction(async (tx) => {
      const [run] = await tx.insert(cleaningRuns).values({
        businessId: actor.businessId, templateId: template.id, templateName: template.name, frequency: template.frequency, steps: template.steps,
        equipmentIds: template.equipmentIds, batchId: input.batchId ?? null, runDate: businessLocalDate(now, timeZone), startedAt: now,
        startedByUserId: actor.userId, startedByName: actor.name, startedByRole: String(actor.role), createdAt: now, updatedAt: now,
      }).returning();
      await tx.insert(cleaningRunVersions).values({
        businessId: actor.businessId, runId: run!.id, version: 1, notes: input.notes ?? '', createdAt: now,
        createdByUserId: actor.userId, createdByName: actor.name, createdByRole: String(actor.role),
      });
      await appendRecordEvent(tx, actor, {
        entityType: ENTITY, entityId: run!.id, action: 'start', occurredAt: now, idempotencyKey: opts.idempotencyKey ?? null, requestId: opts.requestId ?? null,
        payload: { requestHash: hash, templateId: template.id, templateName: template.name, batchId: input.batchId ?? null, runDate: run!.runDate },
      }, now);
      return run!.id;
    });
  });
  return oneRun(db, actor.businessId, id);
}

/** Checks one recorded step against the run's template and the sanitiser rules; answers the row to insert. */
async function stepEntryValues(tx: DbOrTx, actor: Actor, run: CleaningRunRow, runVersionId: string, input: RecordStepInput, now: Date) {
  const step = run.steps.find((s) => s.key === input.stepKey);
  if (!step) throw badRequest('That step is not on this checklist.', { stepKey: ['Choose a step of this checklist'] });
  const base = { businessId: actor.businessId, runId: run.id, runVersionId, stepKey: step.key, entryKind: 'step', doneAt: now, ...who(actor), note: input.note ?? '' };
  if (step.kind !== 'sanitise') {
    if (input.sanitising) throw badRequest(`${step.label} is not a sanitising step; leave out the sanitiser measurements.`, { sanitising: ['Only sanitising steps take measurements'] });
    return base;
  }
  const s = input.sanitising;
  if (!s) throw badRequest('Enter what you sanitised with and what you measured.', { sanitising: ['Enter the sanitiser and its measurements'] });
  let label: SanitiserLabel | null = null;
  if (s.productId) {
    const [product] = await tx.select().from(sanitiserProducts).where(and(eq(sanitiserProducts.id, s.productId), eq(sanitiserProducts.businessId, actor.businessId)));
    if (!product) throw new HttpError(404, 'not_found', 'That sanitiser product does not exist.', { 'sanitising.productId': ['Choose a product of this bakery'] });
    if (product.archivedAt) throw badRequest('That sanitiser product is archived.', { 'sanitising.productId': ['Choose a product still in use'] });
    if (product.sanitiser !== s.sanitiser) throw badRequest(`${product.name} is not ${s.sanitiser.replace('_', ' ')}.`, { 'sanitising.productId': ['The product does not match the sanitiser chosen'] });
    label = {
      minPpm: Number(product.labelMinPpm), maxPpm: Number(product.labelMaxPpm), minTempC: product.labelMinTempC === null ? null : Number(product.labelMinTempC),
      contactSeconds: product.labelContactSeconds, maxHardnessPpm: product.labelMaxHardnessPpm,
    };
  } else if (s.sanitiser === 'quaternary_ammonium' || s.sanitiser === 'label_product') {
    throw badRequest('Choose the product: its label gives the range to check against.', { 'sanitising.productId': ['Choose the product you used'] });
  }
  const check = checkSanitiser({
    sanitiser: s.sanitiser, concentrationPpm: s.concentrationPpm ?? null, waterTemperature: s.waterTemperature ?? null, ph: s.ph ?? null,
    contactSeconds: s.contactSeconds ?? null, hardnessPpm: s.hardnessPpm ?? null, label,
  });
  return {
    ...base,
    sanitiser: s.sanitiser, sanitiserProductId: s.productId ?? null, sanitiserLabel: label as Record<string, unknown> | null,
    concentrationPpm: s.concentrationPpm == null ? null : String(s.concentrationPpm),
    temperatureValue: s.waterTemperature ? String(s.waterTemperature.value) : null, temperatureUnit: s.waterTemperature?.unit ?? null,
    ph: s.ph == null ? null : String(s.ph), contactSeconds: s.contactSeconds ?? null, hardnessPpm: s.hardnessPpm ?? null,
    checkPassed: check.passed, checkProblems: check.problems, failureReason: check.passed ? null : input.failureReason ?? null,
  };
}

const SIGNED_MESSAGE = 'This run is signed and cannot be changed. Make a correction with a reason; it will need signing again.';

/**
 * Records a step done, or explains an earlier failed check. A signed version takes no more entries.
 */
export async function addCleaningStep(db: Db, actor: Actor, runId: string, raw: AddCleaningStepInput, opts: CleaningWriteOptions, now: Date): Promise<CleaningRun> {
  const input = AddCleaningStepInputSchema.parse(raw);
  const hash = requestHash(`step:${runId}`, input);
  await onceForKey(db, actor, opts.idempotencyKey, hash, () => db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const { run, version, entries, signature } = await currentState(tx, actor.businessId, runId);
    if (signature) throw conflict(SIGNED_MESSAGE);
    let values;
    if ('explainsEntryId' in input) {
      const failed = entries.find((e) => e.id === input.explainsEntryId && e.entryKind === 'step');
      if (!failed) throw new HttpError(404, 'not_found', 'That step entry is not in this run.', { explainsEntryId: ['Choose a step of this run'] });
      if (failed.checkPassed !== false) throw badRequest('That step passed its check; there is nothing to explain.', { explainsEntryId: ['Only a failed check needs a reason'] });
      values = { businessId: actor.businessId, runId, runVersionId: version.id, stepKey: failed.stepKey, entryKind: 'explanation', explainsEntryId: failed.id, doneAt: now, ...who(actor), failureReason: input.reason };
    } else {
      values = await stepEntryValues(tx, actor, run, version.id, input, now);
    }
    const [entry] = await tx.insert(cleaningStepEntries).values(values).returning();
    await appendRecordEvent(tx, actor, {
      entityType: ENTITY, entityId: runId, action: entry!.entryKind === 'explanation' ? 'explain_step' : 'record_step', occurredAt: now,
      idempotencyKey: opts.idempotencyKey ?? null, requestId: opts.requestId ?? null, reason: entry!.failureReason,
      payload: { requestHash: hash, entryId: entry!.id, version: version.version, stepKey: entry!.stepKey, checkPassed: entry!.checkPassed, checkProblems: entry!.checkProblems },
    }, now);
    return runId;
  }));
  return oneRun(db, actor.businessId, runId);
}

/** A refused signature is recorded too (21 CFR 11.300(d) model: attempts at unauthorised use are detectable). */
async function recordRefusal(db: Db, actor: Actor, runId: string, signerUserId: string, why: string, now: Date) {
  await db.transaction((tx) => appendRecordEvent(tx, actor, { entityType: ENTITY, entityId: runId, action: 'sign_refused', occurredAt: now, payload: { signerUserId, why } }, now));
}

/**
 * Signs the run's current version. The signer re-enters their own password (checked against their
 * users row); in a member session the signer is that member, on a kitchen device the member chosen.
 * The signature stores printed name, time, meaning and the SHA-256 of the version's content.
 */
export async function signCleaningRun(db: Db, actor: Actor, runId: string, raw: SignCleaningRunInput, opts: CleaningWriteOptions, now: Date): Promise<CleaningRun> {
  const input = SignCleaningRunInputSchema.parse(raw);
  // The password never enters the request hash stored in the journal.
  const hash = requestHash(`sign:${runId}`, { signerUserId: input.signerUserId ?? actor.userId, version: input.version ?? null });
  await onceForKey(db, actor, opts.idempotencyKey, hash, async () => {
    const before = await currentState(db, actor.businessId, runId);
    if (before.signature) throw conflict('This version is already signed.');
    if (input.version !== undefined && input.version !== before.version.version) throw conflict('The run changed since you opened it. Look it over again, then sign.');
    const blockers = signingBlockers(stepStates(before.run, before.entries));
    if (blockers.length) throw conflict(`This run cannot be signed yet. ${blockers.join(' ')}`);

    let signerId: string;
    if (actor.kind === 'member') {
      if (input.signerUserId && input.signerUserId !== actor.userId) throw forbidden('You can sign only as yourself. The other person signs with their own password.');
      signerId = actor.userId!;
    } else if (actor.kind === 'device') {
      if (!input.signerUserId) throw badRequest('Choose who is signing.', { signerUserId: ['Choose your name'] });
      signerId = input.signerUserId;
    } else {
      throw forbidden();
    }
    const [signer] = await db
      .select({ id: users.id, name: users.displayName, passwordHash: users.passwordHash, role: memberships.role })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.businessId, actor.businessId), eq(memberships.isActive, true)))
      .where(eq(users.id, signerId));
    if (!signer) throw badRequest('Choose who is signing.', { signerUserId: ['Choose a member of this bakery'] });
    if (!(await verifyPassword(signer.passwordHash, input.password))) {
      await recordRefusal(db, actor, runId, signerId, 'wrong_password', now);
      throw new HttpError(403, 'forbidden', 'That password is not right, so nothing was signed.', { password: ['That password is not right'] });
    }
    // The meaning is "Cleaned and sanitised": only someone who did a step (or the tablet's user) may say so.
    const recorders = new Set(before.entries.map((e) => e.doneByUserId));
    if (!recorders.has(signerId) && !recorders.has(null)) {
      await recordRefusal(db, actor, runId, signerId, 'did_no_step', now);
      const names = [...new Set(before.entries.map((e) => e.doneByName))].join(', ');
      throw forbidden(`Only someone who did a step of this run can sign it. Ask ${names} to sign with their own password.`);
    }

    return db.transaction(async (tx) => {
      await lockBusiness(tx, actor.businessId);
      const { run, version, entries, signature } = await currentState(tx, actor.businessId, runId);
      if (signature) throw conflict('This version is already signed.');
      if (version.id !== before.version.id || entries.length !== before.entries.length) throw conflict('The run changed while you were signing. Look it over again, then sign.');
      const recordHash = cleaningVersionHash(run, version, entries);
      const [sig] = await tx.insert(cleaningSignatures).values({
        businessId: actor.businessId, runId, runVersionId: version.id, version: version.version, recordHash, signerUserId: signer.id, printedName: signer.name,
        signerRole: signer.role, meaning: CLEANING_SIGNATURE_MEANING, signedAt: now, deviceName: actor.kind === 'device' ? actor.name : null, createdAt: now, updatedAt: now,
      }).returning();
      await appendRecordEvent(tx, { ...actor, userId: signer.id, name: actor.kind === 'device' ? `${signer.name} (on ${actor.name})` : signer.name }, {
        entityType: ENTITY, entityId: runId, action: 'sign', occurredAt: now, idempotencyKey: opts.idempotencyKey ?? null, requestId: opts.requestId ?? null,
        payload: { requestHash: hash, signatureId: sig!.id, version: version.version, recordHash, meaning: CLEANING_SIGNATURE_MEANING, printedName: signer.name, deviceName: sig!.deviceName },
      }, now);
      return runId;
    });
  });
  return oneRun(db, actor.businessId, runId);
}

/**
 * A correction: the next version with a reason. The signed version's entries are carried over as new
 * rows (the originals never change), corrected steps are added, and the new version needs signing.
 */
export async function correctCleaningRun(db: Db, actor: Actor, runId: string, raw: CorrectCleaningRunInput, opts: CleaningWriteOptions, now: Date): Promise<CleaningRun> {
  const input = CorrectCleaningRunInputSchema.parse(raw);
  const hash = requestHash(`correct:${runId}`, input);
  await onceForKey(db, actor, opts.idempotencyKey, hash, () => db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const { run, version, entries, signature } = await currentState(tx, actor.businessId, runId);
    if (!signature) throw conflict('This run is not signed yet: add the corrected step instead of making a correction.');
    const [next] = await tx.insert(cleaningRunVersions).values({
      businessId: actor.businessId, runId, version: version.version + 1, notes: input.notes ?? version.notes, reason: input.reason, createdAt: now,
      createdByUserId: actor.userId, createdByName: actor.name, createdByRole: String(actor.role),
    }).returning();
    const newIds = new Map<string, string>();
    const ordered = [...entries].sort((a, b) => (a.entryKind === b.entryKind ? 0 : a.entryKind === 'step' ? -1 : 1));
    for (const e of ordered) {
      const { id, createdAt: _c, updatedAt: _u, ...rest } = e as CleaningStepEntryRow;
      const [copy] = await tx.insert(cleaningStepEntries).values({
        ...rest, runVersionId: next!.id, carriedFromEntryId: id, explainsEntryId: e.explainsEntryId ? newIds.get(e.explainsEntryId) ?? null : null,
      }).returning({ id: cleaningStepEntries.id });
      newIds.set(id, copy!.id);
    }
    for (const step of input.steps) await tx.insert(cleaningStepEntries).values(await stepEntryValues(tx, actor, run, next!.id, step, now));
    await appendRecordEvent(tx, actor, {
      entityType: ENTITY, entityId: runId, action: 'correct', reason: input.reason, occurredAt: now, idempotencyKey: opts.idempotencyKey ?? null, requestId: opts.requestId ?? null,
      payload: { requestHash: hash, fromVersion: version.version, version: next!.version, correctedSteps: input.steps.map((s) => s.stepKey) },
    }, now);
    return runId;
  }));
  return oneRun(db, actor.businessId, runId);
}

/** Active members, for the "who is signing" choice on a kitchen device. */
export async function listCleaningSigners(db: Db, actor: Actor): Promise<CleaningSignerList> {
  const rows = await db
    .select({ userId: users.id, name: users.displayName, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.businessId, actor.businessId), eq(memberships.isActive, true)))
    .orderBy(asc(users.displayName));
  return { signers: rows };
}

/**
 * What is due: daily checklists not started today, and for food-contact equipment the 4-hour clock of
 * FDA Food Code 2022 4-602.11(C). Equipment counts as in use from the first batch still in progress
 * today; it counts as cleaned at the last passed sanitising step of a run that covers it.
 */
export async function getCleaningDue(db: DbOrTx, businessId: string, now: Date): Promise<CleaningDueList> {
  const timeZone = await businessZone(db, businessId);
  const today = businessLocalDate(now, timeZone);
  const templates = await db.select({ id: cleaningTemplates.id, name: cleaningTemplates.name }).from(cleaningTemplates)
    .where(and(eq(cleaningTemplates.businessId, businessId), eq(cleaningTemplates.frequency, 'daily'), isNull(cleaningTemplates.archivedAt)));
  const todays = await db.select({ templateId: cleaningRuns.templateId }).from(cleaningRuns).where(and(eq(cleaningRuns.businessId, businessId), eq(cleaningRuns.runDate, today)));
  const started = new Set(todays.map((r) => r.templateId));
  const items = await db.select().from(equipment).where(and(eq(equipment.businessId, businessId), eq(equipment.isFoodContact, true), isNull(equipment.archivedAt))).orderBy(asc(equipment.name));
  const [firstBatch] = await db.select({ createdAt: batches.createdAt }).from(batches)
    .where(and(eq(batches.businessId, businessId), eq(batches.madeOn, today), eq(batches.state, 'in_progress'))).orderBy(asc(batches.createdAt)).limit(1);
  const inUseSince = firstBatch && firstBatch.createdAt <= now ? firstBatch.createdAt.toISOString() : null;
  const sanitised = items.length
    ? await db.select({ doneAt: cleaningStepEntries.doneAt, equipmentIds: cleaningRuns.equipmentIds }).from(cleaningStepEntries)
      .innerJoin(cleaningRuns, eq(cleaningRuns.id, cleaningStepEntries.runId))
      .where(and(eq(cleaningStepEntries.businessId, businessId), eq(cleaningStepEntries.entryKind, 'step'), eq(cleaningStepEntries.checkPassed, true), isNull(cleaningStepEntries.carriedFromEntryId), inArray(cleaningRuns.runDate, [today])))
      .orderBy(desc(cleaningStepEntries.doneAt))
    : [];
  const lastCleaned = (id: string) => sanitised.find((s) => s.doneAt <= now && s.equipmentIds.includes(id))?.doneAt ?? null;
  const due = cleaningDueForAll(items.map((i) => ({ equipmentId: i.id, inUseSince, lastCleanedAt: lastCleaned(i.id)?.toISOString() ?? null })), now.toISOString());
  return {
    serverNow: now.toISOString(),
    today,
    dailyTemplatesNotStarted: templates.filter((t) => !started.has(t.id)),
    equipment: due.map((d) => {
      const last = lastCleaned(d.equipmentId);
      return {
        equipmentId: d.equipmentId, name: items.find((i) => i.id === d.equipmentId)!.name, status: d.status, nextDueAt: d.nextDueAt,
        nextDueAtLocal: d.nextDueAt ? formatZonedDateTime(new Date(d.nextDueAt), timeZone) : null, lastCleanedAtLocal: last ? formatZonedDateTime(last, timeZone) : null,
      };
    }),
  };
}
