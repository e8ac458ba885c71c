import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { CreatedInspectorLinkSchema, InspectorLinkListSchema, type CreateInspectorLinkInput } from '@shared/contracts/inspector';
import { DocumentDetailSchema, DocumentListSchema } from '@shared/contracts/documents';

export const recordsQueries = {
  links: () => queryOptions({ queryKey: ['inspector-links'], queryFn: ({ signal }) => api.get('/api/inspector-links', InspectorLinkListSchema, { signal }) }),
  documents: () => queryOptions({ queryKey: ['documents'], queryFn: ({ signal }) => api.get('/api/documents', DocumentListSchema, { signal }) }),
};

export function useCreateInspectorLink() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateInspectorLinkInput) => api.post('/api/inspector-links', CreatedInspectorLinkSchema, input), onSuccess: () => qc.invalidateQueries({ queryKey: ['inspector-links'] }) });
}
export function useRevokeInspectorLink() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (id: string) => api.delete(`/api/inspector-links/${id}`, null), onSuccess: () => qc.invalidateQueries({ queryKey: ['inspector-links'] }) });
}
export function useUploadDocument() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (form: FormData) => api.post('/api/documents', DocumentDetailSchema, form), onSuccess: () => qc.invalidateQueries({ queryKey: ['documents'] }) });
}
