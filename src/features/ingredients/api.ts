import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import {
  IngredientDetailSchema, IngredientListSchema, ImportPreviewSchema, ImportResultSchema, LabelFileSchema, SupplierLotSchema,
  type ArchiveIngredientInput, type CreateIngredientInput, type CreateSupplierLotInput, type IngredientDetail, type LabelCheckInput,
  type ListIngredientsParams, type UpdateIngredientInput,
} from '@shared/contracts/ingredients';

export const ingredientQueries = {
  all: () => ['ingredients'] as const,
  lists: () => [...ingredientQueries.all(), 'list'] as const,
  list: (q: ListIngredientsParams = {}) => queryOptions({ queryKey: [...ingredientQueries.lists(), q], queryFn: ({ signal }) => api.get('/api/ingredients', IngredientListSchema, { params: q, signal }) }),
  detail: (id: string) => queryOptions({ queryKey: [...ingredientQueries.all(), 'detail', id], queryFn: ({ signal }) => api.get(`/api/ingredients/${id}`, IngredientDetailSchema, { signal }) }),
};

/** Where a label photo is shown inline (members only; PDFs always download). */
export const labelFileUrl = (ingredientId: string, fileId: string, how: 'view' | 'download') => `/api/ingredients/${ingredientId}/label-files/${fileId}/${how}`;

function useIngredientWrite<I>(send: (input: I) => Promise<IngredientDetail>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async (detail) => {
      qc.setQueryData(ingredientQueries.detail(detail.id).queryKey, detail);
      await qc.invalidateQueries({ queryKey: ingredientQueries.lists() });
    },
  });
}

export const useCreateIngredient = () => useIngredientWrite((input: CreateIngredientInput) => api.post('/api/ingredients', IngredientDetailSchema, input));
export const useUpdateIngredient = (id: string) => useIngredientWrite((input: UpdateIngredientInput) => api.patch(`/api/ingredients/${id}`, IngredientDetailSchema, input));
export const useVerifyIngredient = (id: string) => useIngredientWrite((input: { note?: string }) => api.post(`/api/ingredients/${id}/verify`, IngredientDetailSchema, input));
export const useArchiveIngredient = (id: string, restore = false) =>
  useIngredientWrite((input: ArchiveIngredientInput) => api.post(`/api/ingredients/${id}/${restore ? 'restore' : 'archive'}`, IngredientDetailSchema, input));

/** Writes that change a child list: refetch the ingredient they belong to. */
function useChildWrite<I, O>(ingredientId: string, send: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: ingredientQueries.detail(ingredientId).queryKey });
      await qc.invalidateQueries({ queryKey: ingredientQueries.lists() });
    },
  });
}

export const useUploadLabelFile = (ingredientId: string) =>
  useChildWrite(ingredientId, (file: File) => {
    const form = new FormData();
    form.append('file', file);
    return api.upload(`/api/ingredients/${ingredientId}/label-files`, LabelFileSchema, form);
  });
export const useReceiveLot = (ingredientId: string) =>
  useChildWrite(ingredientId, (input: CreateSupplierLotInput) => api.post(`/api/ingredients/${ingredientId}/lots`, SupplierLotSchema, input));
export const useRecordLabelCheck = (ingredientId: string) =>
  useChildWrite(ingredientId, ({ lotId, ...input }: LabelCheckInput & { lotId: string }) => api.post(`/api/supplier-lots/${lotId}/label-checks`, SupplierLotSchema, input));

export function useImportPreview() {
  return useMutation({ mutationFn: (csv: string) => api.post('/api/ingredients/import/preview', ImportPreviewSchema, { csv }) });
}
export function useImportConfirm() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (csv: string) => api.post('/api/ingredients/import/confirm', ImportResultSchema, { csv }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ingredientQueries.lists() }),
  });
}
