import { createHash } from 'node:crypto';
import { and, desc, eq, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { ingredients, ingredientLabelFiles } from '../../db/schema/ingredients';
import { appendRecordEvent } from '../records/record-events.service';
import { HttpError, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import type { FileStorage } from '../../lib/storage';
import type { CheckedFile } from '../../lib/uploads';
import { MAX_LABEL_FILES_PER_INGREDIENT, type LabelFile } from '../../../shared/contracts/ingredients';
import { peopleByIds, personRef, requireIngredient } from './ingredients.queries';

type LabelFileRow = typeof ingredientLabelFiles.$inferSelect;

const toLabelFile = (r: LabelFileRow, people: Map<string, string>): LabelFile => ({
  id: r.id,
  ingredientId: r.ingredientId,
  displayName: r.originalName,
  contentType: r.contentType,
  byteSize: r.byteSize,
  sha256: r.sha256,
  isImage: r.contentType.startsWith('image/'),
  uploadedBy: personRef(people, r.uploadedByUserId),
  createdAt: r.createdAt.toISOString(),
});

export async function listLabelFiles(db: DbOrTx, actor: Actor, ingredientId: string): Promise<LabelFile[]> {
  await requireIngredient(db, actor, ingredientId);
  const rows = await db
    .select()
    .from(ingredientLabelFiles)
    .where(and(eq(ingredientLabelFiles.ingredientId, ingredientId), eq(ingredientLabelFiles.businessId, actor.businessId)))
    .orderBy(desc(ingredientLabelFiles.createdAt));
  const people = await peopleByIds(db, rows.map((r) => r.uploadedByUserId));
  return rows.map((r) => toLabelFile(r, people));
}

/**
 * Stores a checked label photo/PDF under a random key and records it. The ingredient row is locked so two
 * uploads at once cannot pass the per-ingredient limit; if the database write fails the stored bytes go too.
 */
export async function addLabelFile(db: Db, storage: FileStorage, actor: Actor, ingredientId: string, file: CheckedFile, now: Date): Promise<LabelFile> {
  let storedKey: string | null = null;
  try {
    const row = await db.transaction(async (tx) => {
      const [owned] = await tx.select({ id: ingredients.id }).from(ingredients)
        .where(and(eq(ingredients.id, ingredientId), eq(ingredients.businessId, actor.businessId))).for('update');
      if (!owned) throw notFound('That ingredient');
      const [{ n }] = (await tx.select({ n: sql<number>`count(*)::int` }).from(ingredientLabelFiles).where(eq(ingredientLabelFiles.ingredientId, ingredientId))) as [{ n: number }];
      if (n >= MAX_LABEL_FILES_PER_INGREDIENT) {
        throw new HttpError(400, 'validation_failed', `This ingredient already has ${MAX_LABEL_FILES_PER_INGREDIENT} label files, the most it can keep. Files are kept as evidence and cannot be removed; if the product really changed, add it as a new ingredient.`, { file: [`At most ${MAX_LABEL_FILES_PER_INGREDIENT} files per ingredient.`] });
      }
      storedKey = await storage.put(file.bytes);
      const sha256 = createHash('sha256').update(file.bytes).digest('hex');
      const [inserted] = await tx.insert(ingredientLabelFiles).values({
        businessId: actor.businessId, ingredientId, storageKey: storedKey, originalName: file.displayName, contentType: file.contentType,
        byteSize: file.bytes.length, sha256, uploadedByUserId: actor.userId, createdAt: now, updatedAt: now,
      }).returning();
      await appendRecordEvent(tx, actor, {
        entityType: 'ingredient_label_file', entityId: inserted!.id, action: 'upload',
        payload: { ingredientId, displayName: file.displayName, contentType: file.contentType, byteSize: file.bytes.length, sha256 },
      }, now);
      return inserted!;
    });
    const people = await peopleByIds(db, [row.uploadedByUserId]);
    return toLabelFile(row, people);
  } catch (err) {
    if (storedKey) await storage.remove(storedKey).catch(() => undefined);
    throw err;
  }
}

/** The stored file, for download; 404 for another business's ingredient or file. */
export async function findLabelFile(db: DbOrTx, actor: Actor, ingredientId: string, fileId: string): Promise<LabelFileRow> {
  const [row] = await db
    .select()
    .from(ingredientLabelFiles)
    .where(and(eq(ingredientLabelFiles.id, fileId), eq(ingredientLabelFiles.ingredientId, ingredientId), eq(ingredientLabelFiles.businessId, actor.businessId)));
  if (!row) throw notFound('That label file');
  return row;
}
