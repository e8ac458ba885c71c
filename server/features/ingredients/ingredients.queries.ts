import { and, desc, eq, inArray, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { ingredientVersions } from '../../db/schema/ingredients';
import { users } from '../../db/schema/auth';
import { notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import type { PersonRef } from '../../../shared/contracts/ingredients';
import type { IngredientDecl } from '../../../shared/domain/recipe-flatten';

export type IngredientVersionRow = typeof ingredientVersions.$inferSelect;

/** The current (highest) version of each ingredient of a business, optionally only the given ids. */
export async function currentIngredientVersions(db: DbOrTx, businessId: string, ids?: readonly string[]): Promise<IngredientVersionRow[]> {
  if (ids && ids.length === 0) return [];
  const where: SQL[] = [eq(ingredientVersions.businessId, businessId)];
  if (ids) where.push(inArray(ingredientVersions.ingredientId, [...ids]));
  return db
    .selectDistinctOn([ingredientVersions.ingredientId])
    .from(ingredientVersions)
    .where(and(...where))
    .orderBy(ingredientVersions.ingredientId, desc(ingredientVersions.version));
}

/** The declaration the label engine reads, from a stored version. */
export function toIngredientDecl(v: IngredientVersionRow): IngredientDecl {
  return {
    id: v.ingredientId,
    labelName: v.labelName,
    subIngredients: v.subIngredients,
    allergens: v.allergens,
    sulphitesMgPerKg: v.sulphitesMgPerKg === null ? null : Number(v.sulphitesMgPerKg),
    needsTimeTemperatureControl: v.needsTimeTemperatureControl,
    isVerified: v.verifiedAt !== null,
    allergensConfirmed: v.allergensConfirmed,
  };
}

/**
 * The current declaration of each ingredient of `businessId` (all of them, or only `ids`), keyed by
 * ingredient id. Archived ingredients are included so existing recipes still resolve; ids of another
 * business are simply absent.
 */
export async function loadIngredientDecls(db: DbOrTx, businessId: string, ids?: readonly string[]): Promise<Map<string, IngredientDecl>> {
  const rows = await currentIngredientVersions(db, businessId, ids);
  return new Map(rows.map((v) => [v.ingredientId, toIngredientDecl(v)]));
}

/** Display names for user ids (people of this business only ever appear here through their own records). */
export async function peopleByIds(db: DbOrTx, ids: Array<string | null | undefined>): Promise<Map<string, string>> {
  const unique = [...new Set(ids.filter((x): x is string => !!x))];
  if (!unique.length) return new Map();
  const rows = await db.select({ id: users.id, name: users.displayName }).from(users).where(inArray(users.id, unique));
  return new Map(rows.map((r) => [r.id, r.name]));
}

export const personRef = (people: Map<string, string>, id: string | null | undefined): PersonRef | null =>
  id ? { userId: id, name: people.get(id) ?? 'Former member' } : null;

/** 404 unless the ingredient is this business's; returns its current version. */
export async function requireIngredient(db: DbOrTx, actor: Actor, id: string): Promise<IngredientVersionRow> {
  const [current] = await currentIngredientVersions(db, actor.businessId, [id]);
  if (!current) throw notFound('That ingredient');
  return current;
}

