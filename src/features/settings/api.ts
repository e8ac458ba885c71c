import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { BusinessSchema, type UpdateBusinessInput } from '@shared/contracts/business';
import type { CopyRuleProfileInput, RuleProfileDetail, SaveRuleProfileVersionInput } from '@shared/contracts/custom-rule-profiles';

const DetailShape = z.custom<RuleProfileDetail>((v) => typeof v === 'object' && v !== null);

export const businessQueries = {
  all: () => ['business'] as const,
  current: () => queryOptions({ queryKey: [...businessQueries.all(), 'current'], queryFn: ({ signal }) => api.get('/api/business', BusinessSchema, { signal }) }),
};

export function useUpdateBusiness() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateBusinessInput) => api.patch('/api/business', BusinessSchema, input),
    onSuccess: async (b) => {
      qc.setQueryData(businessQueries.current().queryKey, b);
      await qc.invalidateQueries({ queryKey: ['rule-profiles'] });
      await qc.invalidateQueries({ queryKey: ['recipes'] });
    },
  });
}

export function useCopyRuleProfile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CopyRuleProfileInput) => api.post('/api/rule-profiles', DetailShape, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['rule-profiles'] }),
  });
}

export function useSaveRuleProfileVersion() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: SaveRuleProfileVersionInput & { id: string }) => api.post(`/api/rule-profiles/${id}/versions`, DetailShape, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['rule-profiles'] }),
  });
}
