import crypto from 'node:crypto';
import { and, asc, desc, eq, gte, inArray, lte, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../../db/client';
import { batches, batchInputs, batchStateChanges, batchVersions } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { supplierLots } from '../../db/schema/ingredients';
import { memberships, users } from '../../db/schema/auth';
import { HttpError, badRequest, conflict, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { appendRecordEvent, findByIdempotencyKey } from '../records/record-events.service';
import { assertTransition, bestByDate, BATCH_TRANSITIONS, type BatchState } from '../../../shared/domain/batch-states';
import { businessLocalDate, formatLotCode } from '../../../shared/domain/lot-codes';
import { flattenRecipe, RecipeFlattenError, toLookup, type IngredientDecl } from '../../../shared/domain/recipe-flatten';
import type {
  BatchDetail, BatchInputRow, BatchPage, BatchRecipeOptions, BatchVersion, BatchWarning, ChangeBatchStateInput,
  CorrectBatchInput, CreateBatchInput, IngredientLotChoice, ListBatchesQuery, LotCandidates, SubRecipeBatchChoice,
} from '../../../shared/contracts/batches';
import {
  allRecipeVersions, batchesOfRecipes, currentIngredients, findBusiness, findRecipeVersion, latestRecipeVersions,
  supplierLotsFor, toRecipeInput, type RecipeVersionRow,
} from './batches.queries';
import { releaseBlockers } from './release-checks';

/** Idempotency-Key and request id of a write (IETF draft-ietf-httpapi-idempotency-key-header-07). */
export interface WriteOptions {
  idempotencyKey?: string;
  requestId?: string;
}

type InputRow = { ingredientId: string | null; supplierLotId: string | null; subRecipeId: string | null; sourceBatchId: string | null };

const ENTITY = 'batch';

function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value && typeof value === 'object') {
    return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined).sort(([a], [b]) => a.localeCompare(b)).map(([k, v]) => [k, canonical(v)]));
  }
  return value;
}

const requestHash = (kind: string, body: unknown) =>
  crypto.createHash('sha256').update(JSON.stringify(canonical({ kind, body }))).digest('hex');

/** Serialises a business's writers (the same lock appendRecordEvent takes): day sequences and retries stay single. */
async function lockBusiness(tx: DbOrTx, businessId: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${businessId}::text, 0))`);
}

/** The batch an earlier request with this key made or changed; a different request under the key is refused. */
async function replayedBatchId(tx: DbOrTx, businessId: string, key: string | undefined, hash: string): Promise<string | null> {
  if (!key) return null;
  const prior = await findByIdempotencyKey(tx, businessId, key);
  if (!prior) return null;
  if (prior.entityType !== ENTITY || (prior.payload as { requestHash?: string }).requestHash !== hash) {
    throw new HttpError(422, 'conflict', 'This Idempotency-Key was already used for a different request. Send a new key for a new change.');
  }
  return prior.entityId;
}

async function assertMember(tx: DbOrTx, businessId: string, userId: string | null | undefined, field: string): Promise<string | null> {
  if (!userId) return null;
  const [m] = await tx
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.businessId, businessId), eq(memberships.userId, userId), eq(memberships.isActive, true)));
  if (!m) throw badRequest('Some fields need attention.', { [field]: ['Choose a member of this business.'] });
  return m.userId;
}

interface RecipeStructure {
  ingredients: Map<string, IngredientDecl>;
  /** Ingredient ids used directly by the recipe. */
  direct: string[];
  /** Top-level sub-recipes with the leaf ingredients they bring. */
  subs: { recipeId: string; name: string; leafIds: string[] }[];
}

async function recipeStructure(tx: DbOrTx, businessId: string, rv: RecipeVersionRow): Promise<RecipeStructure> {
  // Sequential: `tx` may be one client (a transaction), which runs one query at a time.
  const latest = await latestRecipeVersions(tx, businessId);
  const ingredients = await currentIngredients(tx, businessId);
  const recipes = toLookup(latest.map(toRecipeInput));
  const direct = [...new Set(rv.components.flatMap((c) => (c.kind === 'ingredient' ? [c.ingredientId] : [])))];
  const subIds = [...new Set(rv.components.flatMap((c) => (c.kind === 'recipe' ? [c.recipeId] : [])))];
  try {
    const subs = subIds.map((id) => {
      const sub = recipes.get(id);
      if (!sub) throw new RecipeFlattenError('recipe_missing', `${rv.name} uses a recipe that no longer exists.`);
      return { recipeId: id, name: sub.name, leafIds: flattenRecipe(sub, recipes, ingredients).map((l) => l.ingredient.id) };
    });
    return { ingredients, direct, subs };
  } catch (e) {
    if (e instanceof RecipeFlattenError) throw badRequest(e.message, { recipeVersionId: [e.message] });
    throw e;
  }
}

const ingredientName = (s: RecipeStructure, id: string) => s.ingredients.get(id)?.labelName ?? 'Unnamed ingredient';

/**
 * Checks the chosen lots and sub-recipe batches against the recipe version and turns them into input rows:
 * every ingredient that needs a lot gets at least one row (a null lot is kept and shown as a warning).
 */
async function resolveInputs(tx: DbOrTx, businessId: string, rv: RecipeVersionRow, lots: IngredientLotChoice[], subChoices: SubRecipeBatchChoice[], selfId?: string): Promise<InputRow[]> {
  const s = await recipeStructure(tx, businessId, rv);
  const errors: Record<string, string[]> = {};
  const rows: InputRow[] = [];
  const covered = new Set<string>();
  const sourceIds = subChoices.flatMap((c) => (c.sourceBatchId ? [c.sourceBatchId] : []));
  const sources = sourceIds.length
    ? await tx.select({ id: batches.id, recipeId: batches.recipeId, state: batches.state, lotCode: batches.lotCode }).from(batches).where(and(eq(batches.businessId, businessId), inArray(batches.id, sourceIds)))
    : [];
  subChoices.forEach((c, i) => {
    const sub = s.subs.find((x) => x.recipeId === c.recipeId);
    if (!sub) return void (errors[`subRecipeBatches.${i}.recipeId`] = ['That recipe is not a part of this recipe version.']);
    if (!c.sourceBatchId) return;
    const src = sources.find((b) => b.id === c.sourceBatchId);
    if (!src || src.recipeId !== c.recipeId || src.id === selfId) {
      return void (errors[`subRecipeBatches.${i}.sourceBatchId`] = [`Choose a batch of ${sub.name}.`]);
    }
    if (src.state === 'discarded' || src.state === 'recalled') {
      return void (errors[`subRecipeBatches.${i}.sourceBatchId`] = [`Batch ${src.lotCode} of ${sub.name} is ${src.state}; it cannot go into another batch.`]);
    }
    if (covered.has(sub.recipeId)) return;
    covered.add(sub.recipeId);
    rows.push({ ingredientId: null, supplierLotId: null, subRecipeId: sub.recipeId, sourceBatchId: src.id });
  });
  const needed = [...new Set([...s.direct, ...s.subs.filter((x) => !covered.has(x.recipeId)).flatMap((x) => x.leafIds)])];
  const known = await supplierLotsFor(tx, businessId, needed);
  const chosen = new Map<string, Set<string>>();
  lots.forEach((c, i) => {
    if (!needed.includes(c.ingredientId)) {
      return void (errors[`lots.${i}.ingredientId`] = ['That ingredient is not used in this batch, or its sub-recipe comes from another batch.']);
    }
    if (!c.supplierLotId) return;
    if (!known.some((l) => l.id === c.supplierLotId && l.ingredientId === c.ingredientId)) {
      return void (errors[`lots.${i}.supplierLotId`] = [`That lot is not one of the received lots of ${ingredientName(s, c.ingredientId)}.`]);
    }
    chosen.set(c.ingredientId, (chosen.get(c.ingredientId) ?? new Set()).add(c.supplierLotId));
  });
  if (Object.keys(errors).length > 0) throw badRequest('Some inputs need attention.', errors);
  for (const id of needed) {
    const picked = [...(chosen.get(id) ?? [])];
    if (picked.length === 0) rows.push({ ingredientId: id, supplierLotId: null, subRecipeId: null, sourceBatchId: null });
    for (const lot of picked) rows.push({ ingredientId: id, supplierLotId: lot, subRecipeId: null, sourceBatchId: null });
  }
  return rows;
}

async function insertInputs(tx: DbOrTx, businessId: string, batchId: string, batchVersionId: string, rows: InputRow[]) {
  if (rows.length) await tx.insert(batchInputs).values(rows.map((r) => ({ ...r, businessId, batchId, batchVersionId })));
}

function lotCodeFor(scheme: string, prefix: string, madeOn: string, seq: number): string {
  try {
    return formatLotCode(scheme, { prefix, madeOn, seq });
  } catch (e) {
    if (e instanceof RangeError) throw badRequest(`The business's lot-code scheme cannot make a code: ${e.message} An owner can change it in Settings.`);
    throw e;
  }
}

/** Records a new batch of a recipe version: lot code, first version, inputs, "in progress". */
export async function createBatch(db: DbOrTx, actor: Actor, input: CreateBatchInput, now: Date, opts: WriteOptions = {}): Promise<BatchDetail> {
  const hash = requestHash('batch.create', input);
  const batchId = await db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const replayed = await replayedBatchId(tx, actor.businessId, opts.idempotencyKey, hash);
    if (replayed) return replayed;
    const business = await findBusiness(tx, actor.businessId);
    if (!business) throw notFound('That business');
    const rv = await findRecipeVersion(tx, actor.businessId, input.recipeVersionId);
    if (!rv) throw notFound('That recipe version');
    if (rv.isArchived) throw badRequest('That recipe version is archived.', { recipeVersionId: ['That recipe version is archived; choose a current one.'] });
    const today = businessLocalDate(now, business.timeZone);
    const madeOn = input.madeOn ?? today;
    if (madeOn > today) throw badRequest('Some fields need attention.', { madeOn: [`The made-on date cannot be after today (${today} in the business's time zone).`] });
    const madeBy = await assertMember(tx, actor.businessId, input.madeByUserId ?? actor.userId, 'madeByUserId');
    const rows = await resolveInputs(tx, actor.businessId, rv, input.lots ?? [], input.subRecipeBatches ?? []);
    const [{ seq } = { seq: 1 }] = await tx
      .select({ seq: sql<number>`coalesce(max(${batches.daySequence}), 0)::int + 1` })
      .from(batches)
      .where(and(eq(batches.businessId, actor.businessId), eq(batches.madeOn, madeOn)));
    const lotCode = lotCodeFor(business.lotCodeScheme, business.lotCodePrefix, madeOn, seq);
    const shelfLifeDays = input.shelfLifeDays !== undefined ? input.shelfLifeDays : rv.shelfLifeDays;
    const bestBy = shelfLifeDays == null ? null : bestByDate(madeOn, shelfLifeDays);
    const [batch] = await tx
      .insert(batches)
      .values({
        businessId: actor.businessId, lotCode, publicCode: crypto.randomBytes(18).toString('base64url'), recipeId: rv.recipeId,
        recipeVersionId: rv.id, madeOn, daySequence: seq, state: 'in_progress', currentVersion: 1, createdByUserId: actor.userId,
        createdAt: now, updatedAt: now,
      })
      .returning();
    const [version] = await tx
      .insert(batchVersions)
      .values({
        businessId: actor.businessId, batchId: batch!.id, version: 1, madeByUserId: madeBy, quantityPieces: input.quantityPieces ?? null,
        quantityPackages: input.quantityPackages ?? null, shelfLifeDays, bestBy, notes: input.notes ?? '', labelSnapshot: rv.labelSnapshot,
        createdByUserId: actor.userId, createdAt: now, updatedAt: now,
      })
      .returning();
    await insertInputs(tx, actor.businessId, batch!.id, version!.id, rows);
    await tx.insert(batchStateChanges).values({
      businessId: actor.businessId, batchId: batch!.id, fromState: null, toState: 'in_progress', reason: 'Batch recorded',
      changedByUserId: actor.userId, changedByName: actor.name, changedAt: now, createdAt: now, updatedAt: now,
    });
    await appendRecordEvent(tx, actor, {
      entityType: ENTITY, entityId: batch!.id, action: 'create', idempotencyKey: opts.idempotencyKey, requestId: opts.requestId,
      payload: { requestHash: hash, lotCode, recipeVersionId: rv.id, madeOn, version: 1, madeByUserId: madeBy, shelfLifeDays, bestBy, quantityPieces: input.quantityPieces ?? null, quantityPackages: input.quantityPackages ?? null, inputs: rows },
    }, now);
    return batch!.id;
  });
  return getBatchDetail(db, actor, batchId);
}

async function lockedBatch(tx: DbOrTx, businessId: string, batchId: string) {
  const [row] = await tx.select().from(batches).where(and(eq(batches.id, batchId), eq(batches.businessId, businessId))).for('update');
  if (!row) throw notFound('That batch');
  return row;
}

/** A correction: a new version with a reason. The lot code, recipe version and made-on date stay. */
export async function correctBatch(db: DbOrTx, actor: Actor, batchId: string, input: CorrectBatchInput, now: Date, opts: WriteOptions = {}): Promise<BatchDetail> {
  const hash = requestHash('batch.correct', { batchId, input });
  const id = await db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const replayed = await replayedBatchId(tx, actor.businessId, opts.idempotencyKey, hash);
    if (replayed) return replayed;
    const batch = await lockedBatch(tx, actor.businessId, batchId);
    const [prev] = await tx.select().from(batchVersions).where(and(eq(batchVersions.batchId, batch.id), eq(batchVersions.version, batch.currentVersion)));
    const prevRows = await tx
      .select({ ingredientId: batchInputs.ingredientId, supplierLotId: batchInputs.supplierLotId, subRecipeId: batchInputs.subRecipeId, sourceBatchId: batchInputs.sourceBatchId })
      .from(batchInputs)
      .where(eq(batchInputs.batchVersionId, prev!.id));
    let rows: InputRow[] = prevRows;
    if (input.lots !== undefined || input.subRecipeBatches !== undefined) {
      const rv = await findRecipeVersion(tx, actor.businessId, batch.recipeVersionId);
      const lots = input.lots ?? prevRows.flatMap((r) => (r.ingredientId ? [{ ingredientId: r.ingredientId, supplierLotId: r.supplierLotId }] : []));
      const subs = input.subRecipeBatches ?? prevRows.flatMap((r) => (r.subRecipeId && r.sourceBatchId ? [{ recipeId: r.subRecipeId, sourceBatchId: r.sourceBatchId }] : []));
      rows = await resolveInputs(tx, actor.businessId, rv!, lots, subs, batch.id);
    }
    const madeBy = input.madeByUserId !== undefined ? await assertMember(tx, actor.businessId, input.madeByUserId, 'madeByUserId') : prev!.madeByUserId;
    const shelfLifeDays = input.shelfLifeDays !== undefined ? input.shelfLifeDays : prev!.shelfLifeDays;
    const version = batch.currentVersion + 1;
    const values = {
      madeByUserId: madeBy,
      quantityPieces: input.quantityPieces !== undefined ? input.quantityPieces : prev!.quantityPieces,
      quantityPackages: input.quantityPackages !== undefined ? input.quantityPackages : prev!.quantityPackages,
      shelfLifeDays,
      bestBy: shelfLifeDays == null ? null : bestByDate(batch.madeOn, shelfLifeDays),
      notes: input.notes ?? prev!.notes,
    };
    const [row] = await tx
      .insert(batchVersions)
      .values({ businessId: actor.businessId, batchId: batch.id, version, ...values, labelSnapshot: prev!.labelSnapshot, reason: input.reason, createdByUserId: actor.userId, createdAt: now, updatedAt: now })
      .returning();
    await insertInputs(tx, actor.businessId, batch.id, row!.id, rows);
    await tx.update(batches).set({ currentVersion: version, updatedAt: now }).where(eq(batches.id, batch.id));
    await appendRecordEvent(tx, actor, {
      entityType: ENTITY, entityId: batch.id, action: 'correct', reason: input.reason, idempotencyKey: opts.idempotencyKey, requestId: opts.requestId,
      payload: { requestHash: hash, lotCode: batch.lotCode, version, previousVersion: batch.currentVersion, ...values, inputs: rows },
    }, now);
    return batch.id;
  });
  return getBatchDetail(db, actor, id);
}

/** Moves a batch to another state if batch-states allows it; release also asks the registered release checks. */
export async function changeBatchState(db: DbOrTx, actor: Actor, batchId: string, input: ChangeBatchStateInput, now: Date, opts: WriteOptions = {}): Promise<BatchDetail> {
  const hash = requestHash('batch.state', { batchId, input });
  const id = await db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const replayed = await replayedBatchId(tx, actor.businessId, opts.idempotencyKey, hash);
    if (replayed) return replayed;
    const batch = await lockedBatch(tx, actor.businessId, batchId);
    const from = batch.state as BatchState;
    const check = assertTransition(from, input.toState);
    if (!check.ok) throw conflict(check.message, { toState: [check.message] });
    if (input.toState === 'released') {
      const blockers = await releaseBlockers(tx, actor.businessId, batch.id);
      if (blockers.length > 0) {
        const messages = blockers.map((b) => b.message);
        throw conflict(`This batch cannot be released yet: ${messages.join(' ')}`, { toState: messages });
      }
    }
    await tx.insert(batchStateChanges).values({
      businessId: actor.businessId, batchId: batch.id, fromState: from, toState: input.toState, reason: input.reason,
      changedByUserId: actor.userId, changedByName: actor.name, changedAt: now, createdAt: now, updatedAt: now,
    });
    await tx.update(batches).set({ state: input.toState, updatedAt: now }).where(eq(batches.id, batch.id));
    await appendRecordEvent(tx, actor, {
      entityType: ENTITY, entityId: batch.id, action: 'state_change', reason: input.reason, idempotencyKey: opts.idempotencyKey, requestId: opts.requestId,
      payload: { requestHash: hash, lotCode: batch.lotCode, fromState: from, toState: input.toState },
    }, now);
    return batch.id;
  });
  return getBatchDetail(db, actor, id);
}

const madeByUser = alias(users, 'made_by_user');
const createdByUser = alias(users, 'created_by_user');
const sourceBatch = alias(batches, 'source_batch');

const noLotMessage = (name: string) => `No supplier lot recorded for ${name}.`;

/** One batch with its current version, inputs, warnings, state history and version history. */
export async function getBatchDetail(db: DbOrTx, actor: Pick<Actor, 'businessId'>, batchId: string): Promise<BatchDetail> {
  const [head] = await db
    .select({ b: batches, recipeName: recipeVersions.name, recipeVersion: recipeVersions.version })
    .from(batches)
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(and(eq(batches.id, batchId), eq(batches.businessId, actor.businessId)));
  if (!head) throw notFound('That batch');
  const versionRows = await db
    .select({ v: batchVersions, madeByName: madeByUser.displayName, createdByName: createdByUser.displayName })
    .from(batchVersions)
    .leftJoin(madeByUser, eq(madeByUser.id, batchVersions.madeByUserId))
    .leftJoin(createdByUser, eq(createdByUser.id, batchVersions.createdByUserId))
    .where(eq(batchVersions.batchId, batchId))
    .orderBy(desc(batchVersions.version));
  const inputRows = await db
    .select({ i: batchInputs, lotCode: supplierLots.lotCode, receivedOn: supplierLots.receivedOn, sourceLotCode: sourceBatch.lotCode })
    .from(batchInputs)
    .leftJoin(supplierLots, eq(supplierLots.id, batchInputs.supplierLotId))
    .leftJoin(sourceBatch, eq(sourceBatch.id, batchInputs.sourceBatchId))
    .where(eq(batchInputs.batchId, batchId))
    .orderBy(asc(batchInputs.createdAt), asc(batchInputs.id));
  const stateRows = await db.select().from(batchStateChanges).where(eq(batchStateChanges.batchId, batchId)).orderBy(asc(batchStateChanges.changedAt), asc(batchStateChanges.createdAt));
  const ingredients = await currentIngredients(db, actor.businessId);
  const latest = await latestRecipeVersions(db, actor.businessId);
  const recipeNames = new Map(latest.map((r) => [r.recipeId, r.name]));
  const sortKey = (r: BatchInputRow) => (r.kind === 'batch' ? `0${r.subRecipeName}` : `1${r.ingredientName}`);
  const inputsOf = (versionId: string): BatchInputRow[] =>
    inputRows
      .filter((r) => r.i.batchVersionId === versionId)
      .map((r): BatchInputRow =>
        r.i.sourceBatchId
          ? { kind: 'batch', subRecipeId: r.i.subRecipeId!, subRecipeName: recipeNames.get(r.i.subRecipeId!) ?? 'Recipe', sourceBatchId: r.i.sourceBatchId, sourceLotCode: r.sourceLotCode ?? '' }
          : { kind: 'ingredient', ingredientId: r.i.ingredientId!, ingredientName: ingredients.get(r.i.ingredientId!)?.labelName ?? 'Unnamed ingredient', supplierLotId: r.i.supplierLotId, supplierLotCode: r.lotCode, receivedOn: r.receivedOn },
      )
      .sort((a, b) => sortKey(a).localeCompare(sortKey(b)));
  const versions: BatchVersion[] = versionRows.map(({ v, madeByName, createdByName }) => ({
    version: v.version, madeByUserId: v.madeByUserId, madeByName, quantityPieces: v.quantityPieces, quantityPackages: v.quantityPackages,
    shelfLifeDays: v.shelfLifeDays, bestBy: v.bestBy, notes: v.notes, reason: v.reason, createdByName, createdAt: v.createdAt.toISOString(),
    inputs: inputsOf(v.id),
  }));
  const current = versions[0]!;
  const warnings: BatchWarning[] = current.inputs.flatMap((i) =>
    i.kind === 'ingredient' && !i.supplierLotId ? [{ code: 'no_supplier_lot' as const, message: noLotMessage(i.ingredientName), ingredientId: i.ingredientId }] : [],
  );
  const b = head.b;
  return {
    id: b.id, lotCode: b.lotCode, publicCode: b.publicCode, recipeId: b.recipeId, recipeName: head.recipeName, recipeVersionId: b.recipeVersionId,
    recipeVersion: head.recipeVersion, madeOn: b.madeOn, daySequence: b.daySequence, state: b.state as BatchState,
    allowedTransitions: [...BATCH_TRANSITIONS[b.state as BatchState]], current, warnings,
    stateHistory: stateRows.map((s) => ({ fromState: (s.fromState as BatchState | null) ?? null, toState: s.toState as BatchState, reason: s.reason, changedByName: s.changedByName, changedAt: s.changedAt.toISOString() })),
    versions, createdAt: b.createdAt.toISOString(),
  };
}

/** The batch list: one query (joins + a correlated count), newest first. */
export async function listBatches(db: DbOrTx, actor: Pick<Actor, 'businessId'>, q: ListBatchesQuery): Promise<BatchPage> {
  const where: SQL[] = [eq(batches.businessId, actor.businessId)];
  if (q.state) where.push(eq(batches.state, q.state));
  if (q.recipeId) where.push(eq(batches.recipeId, q.recipeId));
  if (q.from) where.push(gte(batches.madeOn, q.from));
  if (q.to) where.push(lte(batches.madeOn, q.to));
  const rows = await db
    .select({
      id: batches.id, lotCode: batches.lotCode, recipeId: batches.recipeId, recipeName: recipeVersions.name, recipeVersion: recipeVersions.version,
      madeOn: batches.madeOn, bestBy: batchVersions.bestBy, state: batches.state, version: batches.currentVersion,
      quantityPieces: batchVersions.quantityPieces, quantityPackages: batchVersions.quantityPackages, madeByName: users.displayName,
      warningCount: sql<number>`(select count(distinct ${batchInputs.ingredientId})::int from ${batchInputs} where ${batchInputs.batchVersionId} = ${batchVersions.id} and ${batchInputs.ingredientId} is not null and ${batchInputs.supplierLotId} is null)`,
      total: sql<number>`count(*) over ()::int`,
    })
    .from(batches)
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .innerJoin(batchVersions, and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.currentVersion)))
    .leftJoin(users, eq(users.id, batchVersions.madeByUserId))
    .where(and(...where))
    .orderBy(desc(batches.madeOn), desc(batches.daySequence))
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  let total = rows[0]?.total ?? 0;
  if (rows.length === 0 && q.page > 1) {
    const [c] = await db.select({ n: sql<number>`count(*)::int` }).from(batches).where(and(...where));
    total = c?.n ?? 0;
  }
  return {
    items: rows.map(({ total: _t, state, ...r }) => ({ ...r, state: state as BatchState })),
    page: q.page, pageSize: q.pageSize, total,
  };
}

/** For the form: per ingredient its received lots, per sub-recipe its batches. */
export async function getLotCandidates(db: DbOrTx, actor: Pick<Actor, 'businessId'>, recipeVersionId: string): Promise<LotCandidates> {
  const rv = await findRecipeVersion(db, actor.businessId, recipeVersionId);
  if (!rv) throw notFound('That recipe version');
  const s = await recipeStructure(db, actor.businessId, rv);
  const all = [...new Set([...s.direct, ...s.subs.flatMap((x) => x.leafIds)])];
  const lots = await supplierLotsFor(db, actor.businessId, all);
  const subBatches = await batchesOfRecipes(db, actor.businessId, s.subs.map((x) => x.recipeId));
  return {
    recipeVersionId: rv.id, recipeId: rv.recipeId, recipeName: rv.name, recipeVersion: rv.version, shelfLifeDays: rv.shelfLifeDays,
    ingredients: all.map((id) => ({
      ingredientId: id, name: ingredientName(s, id), isDirect: s.direct.includes(id),
      lots: lots.filter((l) => l.ingredientId === id).map(({ id: lotId, lotCode, receivedOn, bestBy }) => ({ id: lotId, lotCode, receivedOn, bestBy })),
    })),
    subRecipes: s.subs.map((x) => ({
      recipeId: x.recipeId, name: x.name, ingredientIds: [...new Set(x.leafIds)],
      batches: subBatches.filter((b) => b.recipeId === x.recipeId && b.state !== 'discarded' && b.state !== 'recalled').map(({ id, lotCode, madeOn, state, bestBy }) => ({ id, lotCode, madeOn, state: state as BatchState, bestBy })),
    })),
  };
}

/** Lot candidates for an existing batch's recipe version (the correction form). */
export async function getBatchLotCandidates(db: DbOrTx, actor: Pick<Actor, 'businessId'>, batchId: string): Promise<LotCandidates> {
  const [b] = await db.select({ recipeVersionId: batches.recipeVersionId }).from(batches).where(and(eq(batches.id, batchId), eq(batches.businessId, actor.businessId)));
  if (!b) throw notFound('That batch');
  return getLotCandidates(db, actor, b.recipeVersionId);
}

/** Recipes and their versions (not archived), for choosing what a new batch makes. */
export async function listBatchRecipeOptions(db: DbOrTx, actor: Pick<Actor, 'businessId'>): Promise<BatchRecipeOptions> {
  const versions = await allRecipeVersions(db, actor.businessId);
  const latest = await latestRecipeVersions(db, actor.businessId);
  return {
    recipes: latest
      .filter((l) => !l.isArchived)
      .sort((a, b) => a.name.localeCompare(b.name))
      .map((l) => ({
        recipeId: l.recipeId, name: l.name, isSellable: l.isSellable,
        versions: versions.filter((v) => v.recipeId === l.recipeId && !v.isArchived).map((v) => ({ id: v.id, version: v.version, name: v.name, shelfLifeDays: v.shelfLifeDays })),
      })),
  };
}
