import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, forgetKeptAnswers } from '@/lib/api-client';

export const signOut = () => api<{ ok: true }>('/api/auth/sign-out', { method: 'POST', body: {} });

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      forgetKeptAnswers();
      qc.clear();
    },
  });
}
