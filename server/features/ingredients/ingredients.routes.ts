import { Router, type Request, type RequestHandler } from 'express';
import { z } from 'zod';
import { fileTypeFromBuffer } from 'file-type';
import type { AppDeps } from '../../app';
import { allow, EDITORS, MEMBERS } from '../../middleware/access';
import { HttpError } from '../../lib/http-error';
import { checkUploadedFile, sendStoredFile, singleFileUpload } from '../../lib/uploads';
import { IdParamsSchema } from '../../../shared/contracts/errors';
import {
  ArchiveIngredientInputSchema, CreateIngredientInputSchema, CreateSupplierLotInputSchema, ImportCsvInputSchema, LabelCheckInputSchema,
  ListIngredientsQuerySchema, MAX_LABEL_FILES_PER_INGREDIENT, UpdateIngredientInputSchema, VerifyIngredientInputSchema,
} from '../../../shared/contracts/ingredients';
import {
  archiveIngredient, createIngredient, getIngredient, listIngredients, listIngredientVersions, restoreIngredient, updateIngredient, verifyIngredient,
} from './ingredients.service';
import { addLabelFile, findLabelFile, listLabelFiles } from './label-files.service';
import { createSupplierLot, listSupplierLots, recordLabelCheck } from './supplier-lots.service';
import { confirmImport, previewImport } from './ingredient-import.service';
import { requireIngredient } from './ingredients.queries';

const FileParamsSchema = IdParamsSchema.extend({ fileId: z.string().uuid('That id is not valid') });
const LABEL_KINDS = ['jpg', 'png', 'webp', 'pdf'] as const;
const MAX_CSV_BYTES = 1_000_000;

/** A stored file is only fetched by our own pages, never embedded or opened from another site. */
const sameSiteOnly: RequestHandler = (req, _res, next) =>
  next(req.get('sec-fetch-site') === 'cross-site' ? new HttpError(403, 'forbidden', 'Open label files from Crumbtrail itself.') : undefined);

/** The CSV text from a multipart "file" field or a JSON { csv } body. */
async function csvText(file: Express.Multer.File | undefined, body: unknown): Promise<string> {
  if (!file) return ImportCsvInputSchema.parse(body).csv;
  if (file.size === 0) throw new HttpError(400, 'validation_failed', 'That file is empty.', { file: ['That file is empty.'] });
  const text = file.buffer.toString('utf8');
  if ((await fileTypeFromBuffer(file.buffer)) || text.includes('\u0000') || text.includes('\uFFFD')) {
    throw new HttpError(415, 'unsupported_media_type', 'That is not a CSV text file. Export the spreadsheet as "CSV UTF-8" and try again.', { file: ['Choose a .csv file.'] });
  }
  return text;
}

export function ingredientsRouter(deps: AppDeps) {
  const { db, storage } = deps;
  const actor = (req: Request) => req.actor!;

  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json({ items: await listIngredients(db, actor(req), ListIngredientsQuerySchema.parse(req.query)) });
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createIngredient(db, actor(req), CreateIngredientInputSchema.parse(req.body), deps.now()));
    })
    .post('/import/preview', allow(...EDITORS), singleFileUpload('file', MAX_CSV_BYTES), async (req, res) => {
      res.json(await previewImport(db, actor(req), await csvText(req.file, req.body)));
    })
    .post('/import/confirm', allow(...EDITORS), singleFileUpload('file', MAX_CSV_BYTES), async (req, res) => {
      res.status(201).json(await confirmImport(db, actor(req), await csvText(req.file, req.body), deps.now()));
    })
    .get('/:id', allow(...MEMBERS), async (req, res) => {
      res.json(await getIngredient(db, actor(req), IdParamsSchema.parse(req.params).id));
    })
    .patch('/:id', allow(...EDITORS), async (req, res) => {
      res.json(await updateIngredient(db, actor(req), IdParamsSchema.parse(req.params).id, UpdateIngredientInputSchema.parse(req.body), deps.now()));
    })
    .post('/:id/archive', allow(...EDITORS), async (req, res) => {
      res.json(await archiveIngredient(db, actor(req), IdParamsSchema.parse(req.params).id, ArchiveIngredientInputSchema.parse(req.body), deps.now()));
    })
    .post('/:id/restore', allow(...EDITORS), async (req, res) => {
      res.json(await restoreIngredient(db, actor(req), IdParamsSchema.parse(req.params).id, ArchiveIngredientInputSchema.parse(req.body), deps.now()));
    })
    .post('/:id/verify', allow(...EDITORS), async (req, res) => {
      res.json(await verifyIngredient(db, actor(req), IdParamsSchema.parse(req.params).id, VerifyIngredientInputSchema.parse(req.body ?? {}), deps.now()));
    })
    .get('/:id/versions', allow(...MEMBERS), async (req, res) => {
      res.json({ items: await listIngredientVersions(db, actor(req), IdParamsSchema.parse(req.params).id) });
    })
    .get('/:id/label-files', allow(...MEMBERS), async (req, res) => {
      res.json({ items: await listLabelFiles(db, actor(req), IdParamsSchema.parse(req.params).id), limit: MAX_LABEL_FILES_PER_INGREDIENT });
    })
    .post('/:id/label-files', allow(...EDITORS), singleFileUpload('file'), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      // An unknown ingredient answers 404 before anything about the file is said.
      await requireIngredient(db, actor(req), id);
      const checked = await checkUploadedFile(req.file, LABEL_KINDS);
      res.status(201).json(await addLabelFile(db, storage, actor(req), id, checked, deps.now()));
    })
    .get('/:id/label-files/:fileId/download', allow(...MEMBERS), sameSiteOnly, async (req, res) => {
      const { id, fileId } = FileParamsSchema.parse(req.params);
      const file = await findLabelFile(db, actor(req), id, fileId);
      sendStoredFile(res, await storage.open(file.storageKey), { contentType: file.contentType, displayName: file.originalName, byteSize: file.byteSize });
    })
    // Photos shown in the page (<img>): inline for images only; a PDF is always an attachment.
    .get('/:id/label-files/:fileId/view', allow(...MEMBERS), sameSiteOnly, async (req, res) => {
      const { id, fileId } = FileParamsSchema.parse(req.params);
      const file = await findLabelFile(db, actor(req), id, fileId);
      sendStoredFile(res, await storage.open(file.storageKey), { contentType: file.contentType, displayName: file.originalName, byteSize: file.byteSize }, file.contentType.startsWith('image/'));
    })
    .get('/:id/lots', allow(...MEMBERS), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      await requireIngredient(db, actor(req), id);
      res.json({ items: await listSupplierLots(db, actor(req), { ingredientId: id }) });
    })
    .post('/:id/lots', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createSupplierLot(db, actor(req), IdParamsSchema.parse(req.params).id, CreateSupplierLotInputSchema.parse(req.body), deps.now()));
    });
}

const ListLotsQuerySchema = z.object({
  ingredientId: z.string().uuid('That id is not valid').optional(),
  needsRecheck: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
});

export function supplierLotsRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json({ items: await listSupplierLots(db, req.actor!, ListLotsQuerySchema.parse(req.query)) });
    })
    .post('/:id/label-checks', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await recordLabelCheck(db, req.actor!, IdParamsSchema.parse(req.params).id, LabelCheckInputSchema.parse(req.body), deps.now()));
    });
}
