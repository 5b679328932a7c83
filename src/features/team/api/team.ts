// The workshop's members and invitations (GET /api/team for everyone; the rest for admins).
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Member, Role, Team } from '@shared/schemas';
import type { Invitation, InviteInput } from '@shared/schemas/account';
import type { TeamSettingsInput } from '@shared/schemas/team';
import { api } from '@/lib/api-client';

export const teamKeys = {
  all: ['team'] as const,
  detail: () => [...teamKeys.all, 'detail'] as const,
  invitations: () => [...teamKeys.all, 'invitations'] as const,
};

export const useTeam = () =>
  useQuery({ queryKey: teamKeys.detail(), queryFn: () => api<{ team: Team; members: Member[] }>('/api/team') });

export const useInvitations = (enabled: boolean) =>
  useQuery({ queryKey: teamKeys.invitations(), queryFn: () => api<Invitation[]>('/api/team/invitations'), enabled });

function useTeamMutation<I, O>(fn: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSettled: () => qc.invalidateQueries({ queryKey: teamKeys.all }) });
}

export const useInvite = () => useTeamMutation((input: InviteInput) => api<Invitation>('/api/team/invitations', { method: 'POST', body: input }));
export const useRevokeInvitation = () => useTeamMutation((id: string) => api<{ ok: true }>(`/api/team/invitations/${id}`, { method: 'DELETE' }));
export const useChangeRole = () =>
  useTeamMutation(({ userId, role }: { userId: string; role: Role }) => api<Member>(`/api/team/members/${userId}`, { method: 'PATCH', body: { role } }));
export const useRemoveMember = () => useTeamMutation((userId: string) => api<{ ok: true }>(`/api/team/members/${userId}`, { method: 'DELETE' }));
export const useUpdateTeamSettings = () =>
  useTeamMutation((input: TeamSettingsInput) => api<{ team: Team; members: Member[] }>('/api/team', { method: 'PATCH', body: input }));
