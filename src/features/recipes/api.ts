import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import type {
  AllergenMatrix, LabelInputs, LabelPreview, RecipeDetail, RecipeList, RecipeVersion, RecipeVersionInput, SaveRecipeVersionInput,
} from '@shared/contracts/recipes';
import type { RuleProfileDetail, RuleProfileSummary } from '@shared/contracts/custom-rule-profiles';

// The recipe answers are typed by the shared contract's interfaces; the server builds them from the same types.
const shape = <T,>() => z.custom<T>((v) => typeof v === 'object' && v !== null);

export const recipeQueries = {
  all: () => ['recipes'] as const,
  lists: () => [...recipeQueries.all(), 'list'] as const,
  list: (includeArchived = false) =>
    queryOptions({ queryKey: [...recipeQueries.lists(), { includeArchived }], queryFn: ({ signal }) => api.get('/api/recipes', shape<RecipeList>(), { params: { includeArchived: includeArchived ? 'true' : undefined }, signal }) }),
  detail: (id: string) => queryOptions({ queryKey: [...recipeQueries.all(), 'detail', id], queryFn: ({ signal }) => api.get(`/api/recipes/${id}`, shape<RecipeDetail>(), { signal }) }),
  version: (id: string, version: number) =>
    queryOptions({ queryKey: [...recipeQueries.all(), 'detail', id, 'versions', version], queryFn: ({ signal }) => api.get(`/api/recipes/${id}/versions/${version}`, shape<RecipeVersion>(), { signal }) }),
  preview: (id: string, profileId?: string) =>
    queryOptions({ queryKey: [...recipeQueries.all(), 'detail', id, 'preview', profileId ?? null], queryFn: ({ signal }) => api.get(`/api/recipes/${id}/label-preview`, shape<LabelPreview>(), { params: { profileId }, signal }) }),
  labelInputs: () => queryOptions({ queryKey: [...recipeQueries.all(), 'label-inputs'], queryFn: ({ signal }) => api.get('/api/recipes/label-inputs', shape<LabelInputs>(), { signal }) }),
  matrix: (profileId?: string) =>
    queryOptions({ queryKey: ['allergen-matrix', profileId ?? null], queryFn: ({ signal }) => api.get('/api/allergen-matrix', shape<AllergenMatrix>(), { params: { profileId }, signal }) }),
};

export const ruleProfileQueries = {
  all: () => ['rule-profiles'] as const,
  list: () => queryOptions({ queryKey: [...ruleProfileQueries.all(), 'list'], queryFn: ({ signal }) => api.get('/api/rule-profiles', shape<{ profiles: RuleProfileSummary[] }>(), { signal }) }),
  detail: (id: string) => queryOptions({ queryKey: [...ruleProfileQueries.all(), 'detail', id], queryFn: ({ signal }) => api.get(`/api/rule-profiles/${id}`, shape<RuleProfileDetail>(), { signal }), staleTime: 5 * 60_000 }),
};

function useRecipeWrite<I>(send: (input: I) => Promise<RecipeDetail>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async (detail) => {
      qc.setQueryData(recipeQueries.detail(detail.recipe.id).queryKey, detail);
      await qc.invalidateQueries({ queryKey: recipeQueries.lists() });
      await qc.invalidateQueries({ queryKey: recipeQueries.labelInputs().queryKey });
      await qc.invalidateQueries({ queryKey: ['allergen-matrix'] });
    },
  });
}

export const useCreateRecipe = () => useRecipeWrite((input: RecipeVersionInput) => api.post('/api/recipes', shape<RecipeDetail>(), input));
export const useSaveRecipeVersion = () =>
  useRecipeWrite(({ id, ...input }: SaveRecipeVersionInput & { id: string }) => api.post(`/api/recipes/${id}/versions`, shape<RecipeDetail>(), input));
export const useArchiveRecipe = () =>
  useRecipeWrite(({ id, ...input }: { id: string; reason: string; isArchived: boolean }) => api.post(`/api/recipes/${id}/archive`, shape<RecipeDetail>(), input));
