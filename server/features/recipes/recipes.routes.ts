import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, EDITORS, MEMBERS } from '../../middleware/access';
import {
  AllergenMatrixQuerySchema, ArchiveRecipeInputSchema, CreateRecipeInputSchema, LabelPreviewQuerySchema, RecipeListQuerySchema,
  RecipeParamsSchema, RecipeVersionParamsSchema, SaveRecipeVersionInputSchema,
} from '../../../shared/contracts/recipes';
import {
  allergenMatrix, archiveRecipe, createRecipe, getLabelInputs, getRecipeDetail, getRecipeVersion, labelPreview, listRecipes,
  listRecipeVersions, saveRecipeVersion,
} from './recipes.service';

export function recipesRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json({ recipes: await listRecipes(db, req.actor!, RecipeListQuerySchema.parse(req.query)) });
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      const input = CreateRecipeInputSchema.parse(req.body);
      res.status(201).json(await createRecipe(db, req.actor!, input, deps.now()));
    })
    .get('/label-inputs', allow(...MEMBERS), async (req, res) => {
      res.json(await getLabelInputs(db, req.actor!));
    })
    .get('/:id', allow(...MEMBERS), async (req, res) => {
      const { id } = RecipeParamsSchema.parse(req.params);
      res.json(await getRecipeDetail(db, req.actor!, id));
    })
    .get('/:id/versions', allow(...MEMBERS), async (req, res) => {
      const { id } = RecipeParamsSchema.parse(req.params);
      res.json({ versions: await listRecipeVersions(db, req.actor!, id) });
    })
    .post('/:id/versions', allow(...EDITORS), async (req, res) => {
      const { id } = RecipeParamsSchema.parse(req.params);
      const input = SaveRecipeVersionInputSchema.parse(req.body);
      res.status(201).json(await saveRecipeVersion(db, req.actor!, id, input, deps.now()));
    })
    .get('/:id/versions/:version', allow(...MEMBERS), async (req, res) => {
      const { id, version } = RecipeVersionParamsSchema.parse(req.params);
      res.json(await getRecipeVersion(db, req.actor!, id, version));
    })
    .get('/:id/label-preview', allow(...MEMBERS), async (req, res) => {
      const { id } = RecipeParamsSchema.parse(req.params);
      res.json(await labelPreview(db, req.actor!, id, LabelPreviewQuerySchema.parse(req.query)));
    })
    .post('/:id/archive', allow(...EDITORS), async (req, res) => {
      const { id } = RecipeParamsSchema.parse(req.params);
      const input = ArchiveRecipeInputSchema.parse(req.body);
      res.json(await archiveRecipe(db, req.actor!, id, input, deps.now()));
    });
}

export function allergenMatrixRouter(deps: AppDeps) {
  return Router().get('/', allow(...MEMBERS), async (req, res) => {
    res.json(await allergenMatrix(deps.db, req.actor!, AllergenMatrixQuerySchema.parse(req.query)));
  });
}
