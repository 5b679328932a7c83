// The workshop's members and invitations (GET /api/team for everyone; the rest for admins).
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Member, Role } from '@shared/schemas';
import type { Invitation, InviteInput } from '@shared/schemas/account';
import type { TeamSettingsInput } from '@shared/schemas/team';
import type { TeamDetail } from '@shared/desk-responses';
import { api } from '@/lib/api-client';

/** The team queries; every team change invalidates `all()`. */
export const teamQueries = {
  all: () => ['team'] as const,
  detail: () => queryOptions({ queryKey: [...teamQueries.all(), 'detail'], queryFn: () => api<TeamDetail>('/api/team') }),
  invitations: () => queryOptions({ queryKey: [...teamQueries.all(), 'invitations'], queryFn: () => api<Invitation[]>('/api/team/invitations') }),
};

export const useTeam = () => useQuery(teamQueries.detail());

export const useInvitations = (enabled: boolean) => useQuery({ ...teamQueries.invitations(), enabled });

function useTeamMutation<I, O>(fn: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSettled: () => qc.invalidateQueries({ queryKey: teamQueries.all() }) });
}

export const useInvite = () => useTeamMutation((input: InviteInput) => api<Invitation>('/api/team/invitations', { method: 'POST', body: input }));
export const useRevokeInvitation = () => useTeamMutation((id: string) => api<{ ok: true }>(`/api/team/invitations/${id}`, { method: 'DELETE' }));
export const useChangeRole = () =>
  useTeamMutation(({ userId, role }: { userId: string; role: Role }) => api<Member>(`/api/team/members/${userId}`, { method: 'PATCH', body: { role } }));
export const useRemoveMember = () => useTeamMutation((userId: string) => api<{ ok: true }>(`/api/team/members/${userId}`, { method: 'DELETE' }));
export const useUpdateTeamSettings = () => useTeamMutation((input: TeamSettingsInput) => api<TeamDetail>('/api/team', { method: 'PATCH', body: input }));
