import { and, asc, eq } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { recipes, recipeVersions, type StoredRecipeComponent } from '../../db/schema/recipes';
import { users } from '../../db/schema/auth';
import { appendRecordEvent } from '../records/record-events.service';
import { badRequest, conflict, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { businessRuleProfile, loadRuleProfile } from '../rule-profiles/rule-profiles.service';
import { currentIngredientVersions } from '../ingredients/ingredients.queries';
import {
  currentRecipeVersions, getRecipeVersionForBatch, loadLabelSources, toRecipeForLabel, type LabelSources, type RecipeVersionRow,
} from './recipes.queries';
import type {
  AllergenMatrix, LabelInputs, LabelPreview, ParsedRecipeVersionInput, RecipeComponentView, RecipeDetail, RecipeSummary,
  RecipeVersion, RecipeVersionMeta, WeightInput,
} from '../../../shared/contracts/recipes';
import type { RuleProfile } from '../../../shared/contracts/rule-profiles';
import { regimeAllergenList } from '../../../shared/domain/allergens';
import type { LabelText } from '../../../shared/domain/label-text';
import { flattenRecipe, RecipeFlattenError } from '../../../shared/domain/recipe-flatten';
import {
  diffLabelText, labelTextForRecipe, recipeInputOf, summariseLabelText, type RecipeVersionForLabel,
} from '../../../shared/domain/recipe-label';
import { editableWeight, normaliseGrams, packageNetGrams, toGrams } from '../../../shared/domain/weight-units';

const grams = (w: WeightInput | null) => (w ? toGrams(w.amount, w.unit) : null);
// The columns hold pH to 0.01 and aw to 0.001; rounding first keeps the snapshot equal to what is read back.
const round = (v: number | null, places: number) => (v === null ? null : Number(v.toFixed(places)));

function storedComponents(input: ParsedRecipeVersionInput): StoredRecipeComponent[] {
  return input.components.map((c) => {
    const entered = { amount: normaliseGrams(c.amount), unit: c.unit };
    const g = toGrams(c.amount, c.unit);
    return c.kind === 'ingredient' ? { kind: c.kind, ingredientId: c.ingredientId, grams: g, entered } : { kind: c.kind, recipeId: c.recipeId, grams: g, entered };
  });
}

type VersionValues = Omit<typeof recipeVersions.$inferInsert, 'id' | 'businessId' | 'recipeId' | 'version' | 'reason' | 'createdByUserId' | 'createdAt' | 'updatedAt' | 'labelSnapshot'>;

function versionValues(input: ParsedRecipeVersionInput): VersionValues {
  const ph = round(input.ph, 2);
  const aw = round(input.waterActivity, 3);
  return {
    name: input.name,
    isSellable: input.isSellable,
    components: storedComponents(input),
    yieldGrams: grams(input.yieldWeight),
    yieldPieces: input.yieldPieces,
    pieceGrams: grams(input.pieceWeight),
    piecesPerPackage: input.piecesPerPackage,
    shelfLifeDays: input.shelfLifeDays,
    ph: ph === null ? null : String(ph),
    waterActivity: aw === null ? null : String(aw),
    isHeatTreatedAndPackaged: input.isHeatTreatedAndPackaged,
    holdingPolicy: input.holdingPolicy,
    notes: input.notes,
    isArchived: false,
  };
}

function forLabel(recipeId: string, v: VersionValues): RecipeVersionForLabel {
  return toRecipeForLabel({ ...v, recipeId, yieldGrams: v.yieldGrams ?? null, pieceGrams: v.pieceGrams ?? null, ph: v.ph ?? null, waterActivity: v.waterActivity ?? null } as RecipeVersionRow);
}

/**
 * Refuses components that are not this business's (400 naming the component), a loop through sub-recipes
 * (400 naming it: "Recipe loop: A → B → A") and a sub-recipe whose batch weight is zero. Returns the label text.
 */
function checkAndLabel(recipeId: string, v: VersionValues, sources: LabelSources, profile: RuleProfile): LabelText {
  const fieldErrors: Record<string, string[]> = {};
  v.components!.forEach((c, i) => {
    if (c.kind === 'ingredient' && !sources.ingredients.has(c.ingredientId)) fieldErrors[`components.${i}.ingredientId`] = ['That ingredient does not exist'];
    if (c.kind === 'recipe' && !sources.recipes.has(c.recipeId) && c.recipeId !== recipeId) fieldErrors[`components.${i}.recipeId`] = ['That recipe does not exist'];
  });
  if (Object.keys(fieldErrors).length) throw badRequest('Some components point at ingredients or recipes that do not exist.', fieldErrors);
  const draft = forLabel(recipeId, v);
  const self = recipeInputOf(draft);
  try {
    flattenRecipe(self, new Map(sources.recipes).set(recipeId, self), sources.ingredients);
  } catch (err) {
    if (err instanceof RecipeFlattenError) throw badRequest(err.message, { components: [err.message] });
    throw err;
  }
  return labelTextForRecipe(draft, sources.recipes, sources.ingredients, profile);
}

function componentViews(v: RecipeVersionRow, sources: LabelSources): RecipeComponentView[] {
  return v.components.map((c) => ({
    kind: c.kind,
    ingredientId: c.kind === 'ingredient' ? c.ingredientId : null,
    recipeId: c.kind === 'recipe' ? c.recipeId : null,
    grams: c.grams,
    entered: c.entered ?? editableWeight(c.grams),
    name: c.kind === 'ingredient' ? sources.ingredients.get(c.ingredientId)?.labelName ?? 'Unknown ingredient' : sources.rows.get(c.recipeId)?.name ?? 'Unknown recipe',
  }));
}

const snapshotOf = (v: RecipeVersionRow) => (v.labelSnapshot ?? null) as LabelText | null;

function toVersion(v: RecipeVersionRow, sources: LabelSources, people: Map<string, string>): RecipeVersion {
  const snap = snapshotOf(v);
  return {
    id: v.id, recipeId: v.recipeId, version: v.version, name: v.name, isSellable: v.isSellable,
    components: componentViews(v, sources),
    yieldGrams: v.yieldGrams, yieldPieces: v.yieldPieces, pieceGrams: v.pieceGrams, piecesPerPackage: v.piecesPerPackage,
    netGramsPerPackage: packageNetGrams(v.pieceGrams, v.piecesPerPackage),
    shelfLifeDays: v.shelfLifeDays,
    ph: v.ph === null ? null : Number(v.ph),
    waterActivity: v.waterActivity === null ? null : Number(v.waterActivity),
    isHeatTreatedAndPackaged: v.isHeatTreatedAndPackaged,
    holdingPolicy: (v.holdingPolicy as RecipeVersion['holdingPolicy']) ?? null,
    notes: v.notes, reason: v.reason, isArchived: v.isArchived,
    createdAt: v.createdAt.toISOString(),
    createdBy: v.createdByUserId ? people.get(v.createdByUserId) ?? 'Former member' : null,
    labelSnapshot: snap,
    snapshotProfileId: snap?.profileId ?? null,
  };
}

function toSummary(v: RecipeVersionRow, current: LabelText): RecipeSummary {
  const snap = snapshotOf(v);
  return {
    id: v.recipeId, name: v.name, isSellable: v.isSellable, isArchived: v.isArchived, version: v.version,
    updatedAt: v.createdAt.toISOString(),
    allergens: summariseLabelText(current).allergens,
    tcsResult: current.tcs.result,
    isLabelChanged: snap ? diffLabelText(summariseLabelText(snap), summariseLabelText(current)).length > 0 : true,
  };
}

async function people(db: DbOrTx): Promise<Map<string, string>> {
  const rows = await db.select({ id: users.id, name: users.displayName }).from(users);
  return new Map(rows.map((r) => [r.id, r.name]));
}

async function requireCurrent(db: DbOrTx, actor: Actor, recipeId: string): Promise<RecipeVersionRow> {
  const [row] = await currentRecipeVersions(db, actor.businessId, [recipeId]);
  if (!row) throw notFound('That recipe');
  return row;
}

async function allVersions(db: DbOrTx, actor: Actor, recipeId: string): Promise<RecipeVersionRow[]> {
  const rows = await db.select().from(recipeVersions)
    .where(and(eq(recipeVersions.businessId, actor.businessId), eq(recipeVersions.recipeId, recipeId)))
    .orderBy(asc(recipeVersions.version));
  if (!rows.length) throw notFound('That recipe');
  return rows;
}

export async function listRecipes(db: Db, actor: Actor, query: { includeArchived?: 'true' | 'false' }): Promise<RecipeSummary[]> {
  const [sources, profile] = await Promise.all([loadLabelSources(db, actor.businessId), businessRuleProfile(db, actor.businessId)]);
  return [...sources.rows.values()]
    .filter((v) => query.includeArchived === 'true' || !v.isArchived)
    .map((v) => toSummary(v, labelTextForRecipe(toRecipeForLabel(v), sources.recipes, sources.ingredients, profile)))
    .sort((a, b) => Number(b.isSellable) - Number(a.isSellable) || a.name.localeCompare(b.name));
}

function versionMetas(rows: RecipeVersionRow[], who: Map<string, string>): RecipeVersionMeta[] {
  return rows.map((v, i) => {
    const snap = snapshotOf(v);
    const prev = i > 0 ? snapshotOf(rows[i - 1]!) : null;
    const summary = snap ? summariseLabelText(snap) : null;
    return {
      version: v.version, name: v.name, reason: v.reason, isArchived: v.isArchived, createdAt: v.createdAt.toISOString(),
      createdBy: v.createdByUserId ? who.get(v.createdByUserId) ?? 'Former member' : null,
      summary,
      changes: summary && prev ? diffLabelText(summariseLabelText(prev), summary) : [],
    };
  });
}

export async function getRecipeDetail(db: Db, actor: Actor, recipeId: string): Promise<RecipeDetail> {
  const rows = await allVersions(db, actor, recipeId);
  const current = rows[rows.length - 1]!;
  const [sources, profile, who] = await Promise.all([loadLabelSources(db, actor.businessId), businessRuleProfile(db, actor.businessId), people(db)]);
  const labelText = labelTextForRecipe(toRecipeForLabel(current), sources.recipes, sources.ingredients, profile);
  const snap = snapshotOf(current);
  return {
    recipe: toSummary(current, labelText),
    current: toVersion(current, sources, who),
    labelText,
    profileId: profile.id,
    labelChanges: snap ? diffLabelText(summariseLabelText(snap), summariseLabelText(labelText)) : [],
    versions: versionMetas(rows, who),
    usedBy: [...sources.rows.values()]
      .filter((v) => v.recipeId !== recipeId && v.components.some((c) => c.kind === 'recipe' && c.recipeId === recipeId))
      .map((v) => ({ id: v.recipeId, name: v.name })),
  };
}

export async function createRecipe(db: Db, actor: Actor, input: ParsedRecipeVersionInput, now: Date): Promise<RecipeDetail> {
  const values = versionValues(input);
  const id = await db.transaction(async (tx) => {
    const [sources, profile] = await Promise.all([loadLabelSources(tx, actor.businessId), businessRuleProfile(tx, actor.businessId)]);
    const [recipe] = await tx.insert(recipes).values({ businessId: actor.businessId, createdAt: now, updatedAt: now }).returning({ id: recipes.id });
    const labelSnapshot = checkAndLabel(recipe!.id, values, sources, profile);
    const [row] = await tx.insert(recipeVersions).values({
      ...values, businessId: actor.businessId, recipeId: recipe!.id, version: 1, reason: input.reason || null, labelSnapshot,
      createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    }).returning({ id: recipeVersions.id });
    await appendRecordEvent(tx, actor, { entityType: 'recipe', entityId: recipe!.id, action: 'create', payload: { version: 1, recipeVersionId: row!.id, name: values.name } }, now);
    return recipe!.id;
  });
  return getRecipeDetail(db, actor, id);
}

async function insertNextVersion(tx: DbOrTx, actor: Actor, recipeId: string, basedOnVersion: number | null, build: (head: RecipeVersionRow) => Omit<typeof recipeVersions.$inferInsert, 'businessId' | 'recipeId' | 'version'>, action: string, now: Date) {
  // Lock the recipe's identity row so two saves cannot both become version N + 1.
  const [identity] = await tx.select({ id: recipes.id }).from(recipes).where(and(eq(recipes.id, recipeId), eq(recipes.businessId, actor.businessId))).for('update');
  if (!identity) throw notFound('That recipe');
  const head = await getRecipeVersionForBatch(tx, actor.businessId, recipeId);
  if (basedOnVersion !== null && basedOnVersion !== head.version) {
    throw conflict(`Someone saved version ${head.version} of this recipe while you were editing version ${basedOnVersion}. Reload it and make your change again.`);
  }
  const values = build(head);
  const [row] = await tx.insert(recipeVersions).values({ ...values, businessId: actor.businessId, recipeId, version: head.version + 1 }).returning({ id: recipeVersions.id });
  await appendRecordEvent(tx, actor, {
    entityType: 'recipe', entityId: recipeId, action, payload: { version: head.version + 1, recipeVersionId: row!.id, previousVersion: head.version }, reason: values.reason ?? null,
  }, now);
}

/** Saving makes a new immutable version with the reason and a fresh label snapshot; older versions stay as they were. */
export async function saveRecipeVersion(db: Db, actor: Actor, recipeId: string, input: ParsedRecipeVersionInput & { reason: string; basedOnVersion: number }, now: Date): Promise<RecipeDetail> {
  const values = versionValues(input);
  await db.transaction(async (tx) => {
    const [sources, profile] = await Promise.all([loadLabelSources(tx, actor.businessId), businessRuleProfile(tx, actor.businessId)]);
    await insertNextVersion(tx, actor, recipeId, input.basedOnVersion, () => ({
      ...values, reason: input.reason, labelSnapshot: checkAndLabel(recipeId, values, sources, profile), createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    }), 'update', now);
  });
  return getRecipeDetail(db, actor, recipeId);
}

/** Archiving (or restoring) is a new version that copies the current one, its label snapshot included. */
export async function archiveRecipe(db: Db, actor: Actor, recipeId: string, input: { reason: string; isArchived: boolean }, now: Date): Promise<RecipeDetail> {
  await db.transaction(async (tx) => {
    const head = await requireCurrent(tx, actor, recipeId);
    if (head.isArchived === input.isArchived) throw conflict(input.isArchived ? 'This recipe is already archived.' : 'This recipe is not archived.');
    await insertNextVersion(tx, actor, recipeId, null, (h) => {
      const { id: _id, businessId: _b, recipeId: _r, version: _v, ...copy } = h;
      return { ...copy, isArchived: input.isArchived, reason: input.reason, createdByUserId: actor.userId, createdAt: now, updatedAt: now };
    }, input.isArchived ? 'archive' : 'restore', now);
  });
  return getRecipeDetail(db, actor, recipeId);
}

export async function listRecipeVersions(db: Db, actor: Actor, recipeId: string): Promise<RecipeVersionMeta[]> {
  return versionMetas(await allVersions(db, actor, recipeId), await people(db));
}

export async function getRecipeVersion(db: Db, actor: Actor, recipeId: string, version: number): Promise<RecipeVersion> {
  await requireCurrent(db, actor, recipeId);
  const row = await getRecipeVersionForBatch(db, actor.businessId, recipeId, version).catch(() => {
    throw notFound(`Version ${version} of that recipe`);
  });
  return toVersion(row, await loadLabelSources(db, actor.businessId), await people(db));
}

async function profileFor(db: DbOrTx, actor: Actor, profileId?: string): Promise<RuleProfile> {
  if (!profileId) return businessRuleProfile(db, actor.businessId);
  const found = await loadRuleProfile(db, actor.businessId, profileId);
  if (!found) throw badRequest('That rule profile does not exist.', { profileId: ['Choose a rule profile from the list'] });
  return found.profile;
}

/** Server-computed label text of a saved version (default: current) under a profile (default: the business's). */
export async function labelPreview(db: Db, actor: Actor, recipeId: string, query: { profileId?: string; version?: number }): Promise<LabelPreview> {
  const head = await requireCurrent(db, actor, recipeId);
  const row = query.version === undefined ? head : await getRecipeVersionForBatch(db, actor.businessId, recipeId, query.version).catch(() => {
    throw notFound(`Version ${query.version} of that recipe`);
  });
  const [sources, profile] = await Promise.all([loadLabelSources(db, actor.businessId), profileFor(db, actor, query.profileId)]);
  return { profileId: profile.id, version: row.version, labelText: labelTextForRecipe(toRecipeForLabel(row), sources.recipes, sources.ingredients, profile) };
}

/** Current ingredient declarations and recipes, so the browser can compute label text with the same function. */
export async function getLabelInputs(db: Db, actor: Actor): Promise<LabelInputs> {
  const sources = await loadLabelSources(db, actor.businessId);
  const archived = new Set<string>();
  // Archived ingredients still resolve in old recipes; the editor hides them from search.
  for (const v of await currentIngredientVersions(db, actor.businessId)) if (v.isArchived) archived.add(v.ingredientId);
  return {
    ingredients: [...sources.ingredients.values()].map((d) => ({ ...d, isArchived: archived.has(d.id) })),
    recipes: [...sources.rows.values()].map((r) => ({ ...toRecipeForLabel(r), isArchived: r.isArchived })),
  };
}

/** Sellable, not archived products × the regime's allergens, from the current label text. */
export async function allergenMatrix(db: Db, actor: Actor, query: { profileId?: string }): Promise<AllergenMatrix> {
  const [sources, profile] = await Promise.all([loadLabelSources(db, actor.businessId), profileFor(db, actor, query.profileId)]);
  const regime = { code: profile.allergenRegime.value.regime, ruleSetDate: profile.allergenRegime.value.ruleSetDate };
  const list = regimeAllergenList(regime);
  const products = [...sources.rows.values()]
    .filter((v) => v.isSellable && !v.isArchived)
    .sort((a, b) => a.name.localeCompare(b.name))
    .map((v) => {
      const t = labelTextForRecipe(toRecipeForLabel(v), sources.recipes, sources.ingredients, profile);
      const present = new Map(t.allergenStatement.allergens.map((a) => [a.key as string, a]));
      const warnings = [...new Set(t.cautions.filter((c) => ['allergens_unconfirmed', 'allergen_kind_missing', 'allergen_kind_unknown', 'ingredient_unverified', 'allergen_word_undeclared'].includes(c.code)).map((c) => c.message))];
      return {
        recipeId: v.recipeId, name: v.name, version: v.version,
        cells: list.map((a) => ({ key: a.key, isPresent: present.has(a.key), kinds: present.get(a.key)?.kinds ?? [] })),
        containsLine: t.allergenStatement.containsLine,
        warnings,
      };
    });
  return { profileId: profile.id, regime, allergens: list.map((a) => ({ key: a.key, name: a.name })), products };
}

