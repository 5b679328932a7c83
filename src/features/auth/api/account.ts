// The account calls: sign-up and its confirmation, password reset and change, sign out of all
// devices, the person's own settings, and the invitee's side of an invitation. Inputs are the
// shared schemas the server validates with.
import { queryOptions, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { Me } from '@shared/schemas';
import type { AcceptInvitationInput, ChangePasswordInput, CheckYourMail, InvitationPreview, SignUpInput, UpdateMeInput } from '@shared/schemas/account';
import { api } from '@/lib/api-client';
import { meQuery } from '@/lib/auth/get-me';

/** A new person is signed in on this phone: nothing cached for the last one may show. */
async function startFresh(qc: QueryClient) {
  qc.clear();
  await qc.invalidateQueries({ queryKey: meQuery().queryKey });
}

export const signUp = (input: SignUpInput) => api<CheckYourMail>('/api/auth/sign-up', { method: 'POST', body: input });
export const useSignUp = () => useMutation({ mutationFn: signUp });

export function useConfirmSignUp() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (token: string) => api<{ ok: true }>('/api/auth/sign-up/confirm', { method: 'POST', body: { token } }),
    onSuccess: () => startFresh(qc),
  });
}

export const useRequestPasswordReset = () =>
  useMutation({ mutationFn: (email: string) => api<CheckYourMail>('/api/auth/password-reset', { method: 'POST', body: { email } }) });

export function useResetPassword() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { token: string; password: string }) =>
      api<{ ok: true; signedIn: boolean }>('/api/auth/password-reset/confirm', { method: 'POST', body: input }),
    onSuccess: () => startFresh(qc),
  });
}

export const useChangePassword = () =>
  useMutation({ mutationFn: (input: ChangePasswordInput) => api<{ ok: true }>('/api/auth/change-password', { method: 'POST', body: input }) });

export function useSignOutEverywhere() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ ok: true }>('/api/auth/sign-out-everywhere', { method: 'POST', body: {} }),
    onSuccess: () => qc.clear(),
  });
}

export function useUpdateMe() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateMeInput) => api<Me>('/api/me', { method: 'PATCH', body: input }),
    onSuccess: (me) => qc.setQueryData(meQuery().queryKey, me),
  });
}

/** What an invitation link offers; not kept in the offline cache. */
export const invitationPreviewQuery = (token: string) =>
  queryOptions({
    queryKey: ['invitation-preview', token],
    queryFn: () => api<InvitationPreview>('/api/invitations/preview', { method: 'POST', body: { token } }),
    gcTime: 0,
    staleTime: Infinity,
    retry: false,
    networkMode: 'online',
  });

export const useInvitationPreview = (token: string) => useQuery(invitationPreviewQuery(token));

export function useAcceptInvitation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: AcceptInvitationInput) => api<{ ok: true }>('/api/invitations/accept', { method: 'POST', body: input }),
    onSuccess: () => startFresh(qc),
  });
}
