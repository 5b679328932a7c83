import { useMutation, useQueryClient } from '@tanstack/react-query';
import { signInInput, type SignInInput } from '@shared/schemas';
import { api } from '@/lib/api-client';
import { meQuery } from '@/lib/auth/get-me';

export { signInInput };
export type { SignInInput };

export const signIn = (input: SignInInput) => api<{ ok: true }>('/api/auth/sign-in', { method: 'POST', body: input });

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    // Another person may sign in on this phone: nothing cached for the last one may show.
    onSuccess: async () => {
      qc.clear();
      await qc.invalidateQueries({ queryKey: meQuery().queryKey });
    },
  });
}
