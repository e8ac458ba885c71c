import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import { SessionInfoSchema } from '@shared/contracts/auth';
import {
  CreatedInviteSchema,
  InviteListSchema,
  InvitePreviewSchema,
  MemberListSchema,
  MemberSchema,
  type AcceptInviteInput,
  type ChangeMemberRoleInput,
  type CreateInviteInput,
} from '@shared/contracts/team';

export const teamQueries = {
  all: () => ['team'] as const,
  members: () => queryOptions({ queryKey: [...teamQueries.all(), 'members'], queryFn: ({ signal }) => api.get('/api/team/members', MemberListSchema, { signal }) }),
  invites: () => queryOptions({ queryKey: [...teamQueries.all(), 'invites'], queryFn: ({ signal }) => api.get('/api/team/invites', InviteListSchema, { signal }) }),
};

function useTeamWrite<I, R>(mutationFn: (input: I) => Promise<R>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => qc.invalidateQueries({ queryKey: teamQueries.all() }) });
}

export const useCreateInvite = () => useTeamWrite((input: CreateInviteInput) => api.post('/api/team/invites', CreatedInviteSchema, input));
export const useRevokeInvite = () => useTeamWrite((inviteId: string) => api.delete(`/api/team/invites/${inviteId}`, null));
export const useChangeMemberRole = () =>
  useTeamWrite(({ userId, ...input }: ChangeMemberRoleInput & { userId: string }) => api.patch(`/api/team/members/${userId}`, MemberSchema, input));
export const useSetMemberActive = () =>
  useTeamWrite(({ userId, isActive }: { userId: string; isActive: boolean }) =>
    api.post(`/api/team/members/${userId}/${isActive ? 'enable' : 'disable'}`, MemberSchema),
  );

/** Public: what an invite code is for, before choosing a password. */
export function usePreviewInvite() {
  return useMutation({ mutationFn: (code: string) => api.post('/api/team/invites/preview', InvitePreviewSchema, { code }) });
}

/** Public: accept an invite; signs in and answers the new session. */
export function useAcceptInvite() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: AcceptInviteInput) => api.post('/api/team/invites/accept', SessionInfoSchema, input),
    meta: { isSignInAttempt: true },
    onSuccess: (info) => {
      setCsrfToken(info.csrfToken);
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      qc.setQueryData(['auth', 'session'], info);
    },
  });
}
