import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { ingredients, ingredientVersions, ingredientLabelFiles, supplierLots } from '../../db/schema/ingredients';
import { appendRecordEvent } from '../records/record-events.service';
import { HttpError, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { normaliseName } from '../../../shared/domain/allergens';
import type {
  ArchiveIngredientInput, CreateIngredientInput, Ingredient, IngredientDetail, IngredientVersion, ListIngredientsQuery,
  UpdateIngredientInput, VerifyIngredientInput,
} from '../../../shared/contracts/ingredients';
import { currentIngredientVersions, peopleByIds, personRef, type IngredientVersionRow } from './ingredients.queries';
import { listLabelFiles } from './label-files.service';
import { listSupplierLots } from './supplier-lots.service';

type NewVersion = Omit<typeof ingredientVersions.$inferInsert, 'id' | 'businessId' | 'ingredientId' | 'version' | 'createdAt' | 'updatedAt'>;

const declaredFields = (v: NewVersion | IngredientVersionRow) => JSON.stringify([
  v.labelName, v.subIngredients, v.allergens, v.sulphitesMgPerKg ?? null, v.needsTimeTemperatureControl,
]);

/** The ingredient row, locked for this transaction, or 404 when it is not this business's. */
async function lockIngredient(tx: DbOrTx, actor: Actor, id: string) {
  const [row] = await tx.select().from(ingredients).where(and(eq(ingredients.id, id), eq(ingredients.businessId, actor.businessId))).for('update');
  if (!row) throw notFound('That ingredient');
  const [current] = await currentIngredientVersions(tx, actor.businessId, [id]);
  return current!;
}

function versionValues(input: CreateIngredientInput): NewVersion {
  return {
    labelName: input.labelName,
    subIngredients: input.subIngredients,
    allergens: input.allergens.map((a) => (a.kind ? { source: a.source, kind: a.kind } : { source: a.source })),
    allergensConfirmed: input.allergensConfirmed,
    sulphitesMgPerKg: input.sulphitesMgPerKg === null ? null : String(input.sulphitesMgPerKg),
    needsTimeTemperatureControl: input.needsTimeTemperatureControl,
    supplierName: input.supplierName,
    supplierItemCode: input.supplierItemCode,
    notes: input.notes,
    isArchived: false,
  };
}

const eventPayload = (v: NewVersion & { version: number }) => ({
  version: v.version, labelName: v.labelName, subIngredients: v.subIngredients, allergens: v.allergens,
  allergensConfirmed: v.allergensConfirmed, sulphitesMgPerKg: v.sulphitesMgPerKg ?? null,
  needsTimeTemperatureControl: v.needsTimeTemperatureControl, supplierName: v.supplierName, supplierItemCode: v.supplierItemCode,
  isArchived: v.isArchived, verifiedAt: v.verifiedAt ? new Date(v.verifiedAt).toISOString() : null, verifiedByUserId: v.verifiedByUserId ?? null,
});

async function writeVersion(tx: DbOrTx, actor: Actor, ingredientId: string, version: number, values: NewVersion, action: string, now: Date, extra: Record<string, unknown> = {}) {
  const [row] = await tx
    .insert(ingredientVersions)
    .values({ ...values, businessId: actor.businessId, ingredientId, version, createdByUserId: actor.userId, createdAt: now, updatedAt: now })
    .returning();
  await tx.update(ingredients).set({ updatedAt: now }).where(eq(ingredients.id, ingredientId));
  await appendRecordEvent(tx, actor, { entityType: 'ingredient', entityId: ingredientId, action, payload: { ...eventPayload({ ...values, version }), ...extra }, reason: values.reason ?? null }, now);
  return row!;
}

/** Creates an ingredient and its first version inside an open transaction (shared with the CSV import). */
export async function insertIngredient(tx: DbOrTx, actor: Actor, input: CreateIngredientInput, now: Date, extra: Record<string, unknown> = {}): Promise<string> {
  const [row] = await tx.insert(ingredients).values({ businessId: actor.businessId, createdAt: now, updatedAt: now }).returning({ id: ingredients.id });
  await writeVersion(tx, actor, row!.id, 1, versionValues(input), 'create', now, extra);
  return row!.id;
}

export async function createIngredient(db: Db, actor: Actor, input: CreateIngredientInput, now: Date): Promise<IngredientDetail> {
  const id = await db.transaction((tx) => insertIngredient(tx, actor, input, now));
  return getIngredient(db, actor, id);
}

/** An edit is a new version with the reason. Changing what the package declares clears the verification. */
export async function updateIngredient(db: Db, actor: Actor, id: string, input: UpdateIngredientInput, now: Date): Promise<IngredientDetail> {
  await db.transaction(async (tx) => {
    const current = await lockIngredient(tx, actor, id);
    if (input.baseVersion && input.baseVersion !== current.version) {
      throw new HttpError(409, 'conflict', `Someone saved version ${current.version} of this ingredient while you were editing. Reload to see it, then make your change again.`);
    }
    const { reason, baseVersion: _base, ...changes } = input;
    const merged = versionValues({
      labelName: changes.labelName ?? current.labelName,
      subIngredients: changes.subIngredients ?? current.subIngredients,
      allergens: changes.allergens ?? current.allergens,
      allergensConfirmed: changes.allergensConfirmed ?? current.allergensConfirmed,
      sulphitesMgPerKg: changes.sulphitesMgPerKg !== undefined ? changes.sulphitesMgPerKg : current.sulphitesMgPerKg === null ? null : Number(current.sulphitesMgPerKg),
      needsTimeTemperatureControl: changes.needsTimeTemperatureControl ?? current.needsTimeTemperatureControl,
      supplierName: changes.supplierName ?? current.supplierName,
      supplierItemCode: changes.supplierItemCode ?? current.supplierItemCode,
      notes: changes.notes ?? current.notes,
    });
    const allergensChanged = JSON.stringify(merged.allergens) !== JSON.stringify(current.allergens);
    if (allergensChanged && changes.allergensConfirmed === undefined) merged.allergensConfirmed = false;
    const declarationChanged = declaredFields(merged) !== declaredFields(current);
    const unchanged = !declarationChanged && JSON.stringify([merged.allergensConfirmed, merged.supplierName, merged.supplierItemCode, merged.notes])
      === JSON.stringify([current.allergensConfirmed, current.supplierName, current.supplierItemCode, current.notes]);
    if (unchanged) throw new HttpError(400, 'validation_failed', 'Nothing changed: edit a field before saving.', { _form: ['Nothing changed.'] });
    await writeVersion(tx, actor, id, current.version + 1, {
      ...merged,
      isArchived: current.isArchived,
      verifiedByUserId: declarationChanged ? null : current.verifiedByUserId,
      verifiedAt: declarationChanged ? null : current.verifiedAt,
      reason,
    }, 'edit', now);
  });
  return getIngredient(db, actor, id);
}

async function copyWithChange(db: Db, actor: Actor, id: string, now: Date, change: (c: IngredientVersionRow) => Partial<NewVersion>, action: string) {
  await db.transaction(async (tx) => {
    const current = await lockIngredient(tx, actor, id);
    const { id: _id, businessId: _b, ingredientId: _i, version, createdAt: _c, updatedAt: _u, createdByUserId: _cb, ...rest } = current;
    await writeVersion(tx, actor, id, version + 1, { ...rest, ...change(current) }, action, now);
  });
  return getIngredient(db, actor, id);
}

/** Archiving hides it from pickers; recipes that already use it keep resolving. */
export async function archiveIngredient(db: Db, actor: Actor, id: string, input: ArchiveIngredientInput, now: Date) {
  return copyWithChange(db, actor, id, now, (c) => {
    if (c.isArchived) throw new HttpError(409, 'conflict', 'That ingredient is already archived.');
    return { isArchived: true, reason: input.reason };
  }, 'archive');
}

export async function restoreIngredient(db: Db, actor: Actor, id: string, input: ArchiveIngredientInput, now: Date) {
  return copyWithChange(db, actor, id, now, (c) => {
    if (!c.isArchived) throw new HttpError(409, 'conflict', 'That ingredient is not archived.');
    return { isArchived: false, reason: input.reason };
  }, 'restore');
}

/** "Checked against the package in hand": records who and when, and confirms the allergens with it. */
export async function verifyIngredient(db: Db, actor: Actor, id: string, input: VerifyIngredientInput, now: Date) {
  return copyWithChange(db, actor, id, now, () => ({
    verifiedByUserId: actor.userId,
    verifiedAt: now,
    allergensConfirmed: true,
    reason: input.note ? `Verified against the package: ${input.note}` : 'Verified against the package',
  }), 'verify');
}

interface Counts { files: number; lots: number; recheck: number }

async function countsFor(db: DbOrTx, businessId: string, ids: string[]): Promise<Map<string, Counts>> {
  const out = new Map<string, Counts>(ids.map((id) => [id, { files: 0, lots: 0, recheck: 0 }]));
  if (!ids.length) return out;
  const files = await db
    .select({ id: ingredientLabelFiles.ingredientId, n: sql<number>`count(*)::int` })
    .from(ingredientLabelFiles)
    .where(and(eq(ingredientLabelFiles.businessId, businessId), inArray(ingredientLabelFiles.ingredientId, ids)))
    .groupBy(ingredientLabelFiles.ingredientId);
  for (const f of files) out.get(f.id)!.files = f.n;
  const lots = await db
    .select({
      id: supplierLots.ingredientId,
      n: sql<number>`count(*)::int`,
      recheck: sql<number>`count(*) filter (where not exists (select 1 from supplier_lot_label_checks c where c.supplier_lot_id = supplier_lots.id))::int`,
    })
    .from(supplierLots)
    .where(and(eq(supplierLots.businessId, businessId), inArray(supplierLots.ingredientId, ids)))
    .groupBy(supplierLots.ingredientId);
  for (const l of lots) Object.assign(out.get(l.id)!, { lots: l.n, recheck: l.recheck });
  return out;
}

/** What a version declares, as the package says it: the same in the current view and in the history. */
function declaredView(v: IngredientVersionRow) {
  return {
    labelName: v.labelName,
    subIngredients: v.subIngredients,
    allergens: v.allergens,
    allergensConfirmed: v.allergensConfirmed,
    sulphitesMgPerKg: v.sulphitesMgPerKg === null ? null : Number(v.sulphitesMgPerKg),
    needsTimeTemperatureControl: v.needsTimeTemperatureControl,
    supplierName: v.supplierName,
    supplierItemCode: v.supplierItemCode,
    notes: v.notes,
    isArchived: v.isArchived,
  };
}

function toIngredient(v: IngredientVersionRow, createdAt: Date, people: Map<string, string>, counts: Counts): Ingredient {
  return {
    id: v.ingredientId,
    version: v.version,
    ...declaredView(v),
    isVerified: v.verifiedAt !== null,
    verifiedBy: personRef(people, v.verifiedByUserId),
    verifiedAt: v.verifiedAt?.toISOString() ?? null,
    createdAt: createdAt.toISOString(),
    updatedAt: v.createdAt.toISOString(),
    updatedBy: personRef(people, v.createdByUserId),
    labelFileCount: counts.files,
    lotCount: counts.lots,
    needsLabelRecheck: counts.recheck > 0,
  };
}

async function hydrate(db: DbOrTx, businessId: string, versions: IngredientVersionRow[]): Promise<Ingredient[]> {
  const ids = versions.map((v) => v.ingredientId);
  const [counts, people, firsts] = await Promise.all([
    countsFor(db, businessId, ids),
    peopleByIds(db, versions.flatMap((v) => [v.createdByUserId, v.verifiedByUserId])),
    ids.length ? db.select({ id: ingredients.id, createdAt: ingredients.createdAt }).from(ingredients).where(inArray(ingredients.id, ids)) : Promise.resolve([]),
  ]);
  const created = new Map(firsts.map((f) => [f.id, f.createdAt]));
  return versions.map((v) => toIngredient(v, created.get(v.ingredientId) ?? v.createdAt, people, counts.get(v.ingredientId)!));
}

export async function listIngredients(db: Db, actor: Actor, q: ListIngredientsQuery): Promise<Ingredient[]> {
  let versions = await currentIngredientVersions(db, actor.businessId);
  if (!q.includeArchived) versions = versions.filter((v) => !v.isArchived);
  if (q.allergen) versions = versions.filter((v) => v.allergens.some((a) => a.source === q.allergen));
  if (q.status === 'unverified') versions = versions.filter((v) => v.verifiedAt === null);
  if (q.status === 'tcs') versions = versions.filter((v) => v.needsTimeTemperatureControl);
  if (q.q) {
    const needle = normaliseName(q.q);
    versions = versions.filter((v) => [v.labelName, v.supplierName, v.supplierItemCode, ...v.subIngredients].some((s) => normaliseName(s).includes(needle)));
  }
  let items = await hydrate(db, actor.businessId, versions);
  if (q.status === 'recheck') items = items.filter((i) => i.needsLabelRecheck);
  return items.sort((a, b) => a.labelName.localeCompare(b.labelName));
}

/** What kind of change made each version, read from how it differs from the one before. */
function changeKind(v: IngredientVersionRow, prev: IngredientVersionRow | undefined): IngredientVersion['change'] {
  if (!prev) return 'create';
  if (v.isArchived !== prev.isArchived) return v.isArchived ? 'archive' : 'restore';
  if (v.verifiedAt && v.verifiedAt.getTime() !== prev.verifiedAt?.getTime()) return 'verify';
  return 'edit';
}

export async function listIngredientVersions(db: DbOrTx, actor: Actor, id: string): Promise<IngredientVersion[]> {
  const rows = await db
    .select()
    .from(ingredientVersions)
    .where(and(eq(ingredientVersions.ingredientId, id), eq(ingredientVersions.businessId, actor.businessId)))
    .orderBy(asc(ingredientVersions.version));
  if (!rows.length) throw notFound('That ingredient');
  const people = await peopleByIds(db, rows.flatMap((r) => [r.createdByUserId, r.verifiedByUserId]));
  return rows
    .map((v, i): IngredientVersion => ({
      id: v.id,
      version: v.version,
      change: changeKind(v, rows[i - 1]),
      ...declaredView(v),
      verifiedBy: personRef(people, v.verifiedByUserId),
      verifiedAt: v.verifiedAt?.toISOString() ?? null,
      reason: v.reason,
      createdBy: personRef(people, v.createdByUserId),
      createdAt: v.createdAt.toISOString(),
    }))
    .sort((a, b) => b.version - a.version);
}

export async function getIngredient(db: Db, actor: Actor, id: string): Promise<IngredientDetail> {
  const [current] = await currentIngredientVersions(db, actor.businessId, [id]);
  if (!current) throw notFound('That ingredient');
  const [[ingredient], versions, labelFiles, lots] = await Promise.all([
    hydrate(db, actor.businessId, [current]),
    listIngredientVersions(db, actor, id),
    listLabelFiles(db, actor, id),
    listSupplierLots(db, actor, { ingredientId: id }),
  ]);
  return { ...ingredient!, versions, labelFiles, lots };
}
