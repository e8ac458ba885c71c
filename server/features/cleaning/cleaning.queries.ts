import { and, asc, eq, gte, inArray, lte, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import {
  cleaningRuns, cleaningRunVersions, cleaningSignatures, cleaningStepEntries, sanitiserProducts,
  type CleaningRunRow, type CleaningRunVersionRow, type CleaningSignatureRow, type CleaningStepEntryRow,
} from '../../db/schema/cleaning';
import { batches } from '../../db/schema/batches';
import { businesses } from '../../db/schema/business';
import { canonicalJson, sha256Hex } from '../../../shared/domain/record-chain';
import { formatTemperatureBoth, type TemperatureUnit } from '../../../shared/domain/temperature';
import { formatIsoWithOffset, formatZonedDateTime } from '../../../shared/domain/zoned-time';
import type { Sanitiser } from '../../../shared/domain/sanitiser-checks';
import type { CleaningRun, CleaningSignature, CleaningStepEntry } from '../../../shared/contracts/cleaning';

export async function businessZone(db: DbOrTx, businessId: string): Promise<string> {
  const [row] = await db.select({ timeZone: businesses.timeZone }).from(businesses).where(eq(businesses.id, businessId));
  return row?.timeZone ?? 'UTC';
}

const byDoneAt = (a: CleaningStepEntryRow, b: CleaningStepEntryRow) => a.doneAt.getTime() - b.doneAt.getTime() || a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id);

/**
 * The content a signature covers: the run's identity, the signed version and every entry of that
 * version, as plain JSON. Everything a reader relies on is in it (values, who, when, check results).
 */
export function cleaningVersionContent(run: CleaningRunRow, version: CleaningRunVersionRow, entries: readonly CleaningStepEntryRow[]) {
  return {
    run: {
      id: run.id, businessId: run.businessId, templateId: run.templateId, templateName: run.templateName, frequency: run.frequency, steps: run.steps,
      equipmentIds: run.equipmentIds, batchId: run.batchId, runDate: run.runDate, startedAt: run.startedAt.toISOString(), startedByUserId: run.startedByUserId, startedByName: run.startedByName,
    },
    version: {
      id: version.id, version: version.version, notes: version.notes, reason: version.reason, createdAt: version.createdAt.toISOString(),
      createdByUserId: version.createdByUserId, createdByName: version.createdByName,
    },
    entries: [...entries].sort(byDoneAt).map((e) => ({
      id: e.id, stepKey: e.stepKey, entryKind: e.entryKind, explainsEntryId: e.explainsEntryId, doneAt: e.doneAt.toISOString(), doneByUserId: e.doneByUserId,
      doneByName: e.doneByName, doneByRole: e.doneByRole, note: e.note, sanitiser: e.sanitiser, sanitiserProductId: e.sanitiserProductId, sanitiserLabel: e.sanitiserLabel,
      concentrationPpm: e.concentrationPpm, temperatureValue: e.temperatureValue, temperatureUnit: e.temperatureUnit, ph: e.ph, contactSeconds: e.contactSeconds,
      hardnessPpm: e.hardnessPpm, checkPassed: e.checkPassed, checkProblems: e.checkProblems, failureReason: e.failureReason, carriedFromEntryId: e.carriedFromEntryId,
    })),
  };
}

/** SHA-256 (hex) of the canonical JSON of a version's content: what a signature stores and is checked against. */
export function cleaningVersionHash(run: CleaningRunRow, version: CleaningRunVersionRow, entries: readonly CleaningStepEntryRow[]): string {
  return sha256Hex(canonicalJson(cleaningVersionContent(run, version, entries)));
}

/** A signature as shown everywhere: printed name, time with offset, meaning, and whether it still matches. */
export function toSignatureView(sig: CleaningSignatureRow, currentHash: string, timeZone: string): CleaningSignature {
  const valid = sig.recordHash === currentHash;
  return {
    id: sig.id, version: sig.version, printedName: sig.printedName, signerUserId: sig.signerUserId, signerRole: sig.signerRole, meaning: sig.meaning,
    signedAt: sig.signedAt.toISOString(), signedAtIso: formatIsoWithOffset(sig.signedAt, timeZone), signedAtLocal: formatZonedDateTime(sig.signedAt, timeZone),
    deviceName: sig.deviceName, recordHash: sig.recordHash, validity: valid ? 'valid' : 'invalid', validityText: valid ? 'Signature valid' : 'Signature invalid',
  };
}

export interface StepState {
  key: string;
  kind: CleaningRunRow['steps'][number]['kind'];
  label: string;
  done: boolean;
  needsRedoOrReason: boolean;
  latestEntryId: string | null;
}

/** Per template step: done, and whether its latest sanitiser check failed with no reason given. */
export function stepStates(run: CleaningRunRow, entries: readonly CleaningStepEntryRow[]): StepState[] {
  const sorted = [...entries].sort(byDoneAt);
  const explained = new Set(sorted.filter((e) => e.entryKind === 'explanation').map((e) => e.explainsEntryId));
  return run.steps.map((s) => {
    const latest = sorted.filter((e) => e.entryKind === 'step' && e.stepKey === s.key).at(-1);
    const failedOpen = !!latest && latest.checkPassed === false && !latest.failureReason && !explained.has(latest.id);
    return { key: s.key, kind: s.kind, label: s.label, done: !!latest, needsRedoOrReason: failedOpen, latestEntryId: latest?.id ?? null };
  });
}

/** What stops the version from being signed, in words for the person at the sink. */
export function signingBlockers(states: readonly StepState[]): string[] {
  return [
    ...states.filter((s) => !s.done).map((s) => `Not done yet: ${s.label}.`),
    ...states.filter((s) => s.needsRedoOrReason).map((s) => `${s.label} failed its check: redo it, or give the reason it was accepted.`),
  ];
}

export interface RunFilter {
  runIds?: string[];
  runDate?: string;
  batchId?: string;
  from?: string;
  to?: string;
}

interface LoadedRun {
  row: CleaningRunRow;
  versions: CleaningRunVersionRow[];
  entries: CleaningStepEntryRow[];
  signatures: CleaningSignatureRow[];
}

/** The raw rows of the matching runs (oldest first), each with all its versions, entries and signatures. */
export async function loadRunRows(db: DbOrTx, businessId: string, filter: RunFilter): Promise<LoadedRun[]> {
  const where: SQL[] = [eq(cleaningRuns.businessId, businessId)];
  if (filter.runIds) where.push(inArray(cleaningRuns.id, filter.runIds.length ? filter.runIds : ['00000000-0000-0000-0000-000000000000']));
  if (filter.runDate) where.push(eq(cleaningRuns.runDate, filter.runDate));
  if (filter.batchId) where.push(eq(cleaningRuns.batchId, filter.batchId));
  if (filter.from) where.push(gte(cleaningRuns.runDate, filter.from));
  if (filter.to) where.push(lte(cleaningRuns.runDate, filter.to));
  const runs = await db.select().from(cleaningRuns).where(and(...where)).orderBy(asc(cleaningRuns.startedAt));
  if (runs.length === 0) return [];
  const ids = runs.map((r) => r.id);
  const versions = await db.select().from(cleaningRunVersions).where(inArray(cleaningRunVersions.runId, ids));
  const entries = await db.select().from(cleaningStepEntries).where(inArray(cleaningStepEntries.runId, ids));
  const signatures = await db.select().from(cleaningSignatures).where(inArray(cleaningSignatures.runId, ids));
  return runs.map((row) => ({
    row,
    versions: versions.filter((v) => v.runId === row.id).sort((a, b) => a.version - b.version),
    entries: entries.filter((e) => e.runId === row.id),
    signatures: signatures.filter((s) => s.runId === row.id),
  }));
}

function toEntryView(e: CleaningStepEntryRow, productNames: Map<string, string>, timeZone: string): CleaningStepEntry {
  const t = e.temperatureValue !== null && e.temperatureUnit ? { value: e.temperatureValue, unit: e.temperatureUnit as TemperatureUnit } : null;
  return {
    id: e.id, stepKey: e.stepKey, entryKind: e.entryKind as CleaningStepEntry['entryKind'], explainsEntryId: e.explainsEntryId, note: e.note,
    at: e.doneAt.toISOString(), atLocal: formatZonedDateTime(e.doneAt, timeZone), by: e.doneByName,
    sanitising: e.sanitiser ? {
      sanitiser: e.sanitiser as Sanitiser, productId: e.sanitiserProductId, productName: e.sanitiserProductId ? productNames.get(e.sanitiserProductId) ?? null : null,
      concentrationPpm: e.concentrationPpm, waterTemperature: t ? { ...t, display: formatTemperatureBoth(t) } : null, ph: e.ph, contactSeconds: e.contactSeconds,
      hardnessPpm: e.hardnessPpm, passed: e.checkPassed === true, problems: e.checkProblems ?? [],
    } : null,
    failureReason: e.failureReason, carriedOver: e.carriedFromEntryId !== null,
  };
}

/** Runs as the API shows them, with each version's signature checked against its content now. */
export async function loadCleaningRuns(db: DbOrTx, businessId: string, filter: RunFilter): Promise<CleaningRun[]> {
  const loaded = await loadRunRows(db, businessId, filter);
  if (loaded.length === 0) return [];
  const timeZone = await businessZone(db, businessId);
  const batchIds = [...new Set(loaded.flatMap((l) => (l.row.batchId ? [l.row.batchId] : [])))];
  const lots = batchIds.length ? await db.select({ id: batches.id, lotCode: batches.lotCode }).from(batches).where(inArray(batches.id, batchIds)) : [];
  const productIds = [...new Set(loaded.flatMap((l) => l.entries.flatMap((e) => (e.sanitiserProductId ? [e.sanitiserProductId] : []))))];
  const products = productIds.length ? await db.select({ id: sanitiserProducts.id, name: sanitiserProducts.name }).from(sanitiserProducts).where(inArray(sanitiserProducts.id, productIds)) : [];
  const productNames = new Map(products.map((p) => [p.id, p.name]));
  return loaded.map(({ row, versions, entries, signatures }) => {
    const views = versions.map((v) => {
      const own = entries.filter((e) => e.runVersionId === v.id);
      const sig = signatures.find((s) => s.runVersionId === v.id);
      return {
        version: v.version, notes: v.notes, reason: v.reason, createdAt: v.createdAt.toISOString(), createdAtLocal: formatZonedDateTime(v.createdAt, timeZone), createdBy: v.createdByName,
        entries: own.sort(byDoneAt).map((e) => toEntryView(e, productNames, timeZone)),
        signature: sig ? toSignatureView(sig, cleaningVersionHash(row, v, own), timeZone) : null,
      };
    });
    const current = versions.at(-1)!;
    const states = stepStates(row, entries.filter((e) => e.runVersionId === current.id));
    const blockers = signingBlockers(states);
    const signature = views.at(-1)!.signature;
    const status: CleaningRun['status'] = signature ? (signature.validity === 'valid' ? 'signed' : 'signature_invalid') : blockers.length ? 'in_progress' : 'ready_to_sign';
    return {
      id: row.id, templateId: row.templateId, templateName: row.templateName, frequency: row.frequency as CleaningRun['frequency'], batchId: row.batchId,
      batchLotCode: lots.find((b) => b.id === row.batchId)?.lotCode ?? null, runDate: row.runDate,
      started: { at: row.startedAt.toISOString(), atLocal: formatZonedDateTime(row.startedAt, timeZone), by: row.startedByName },
      equipmentIds: row.equipmentIds, status, blockers: signature ? [] : blockers, currentVersion: current.version, steps: states, versions: views.reverse(),
    };
  });
}
