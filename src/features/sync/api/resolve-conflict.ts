import { useMutation } from '@tanstack/react-query';
import { resolveConflictInput, syncConflict, type ResolveConflictInput } from '@shared/schemas/sync';
import { api } from '@/lib/api-client';
import { keepResolvedConflict } from '@/lib/db/conflicts';
import { syncNow } from '../engine/sync-engine';

export const resolveConflict = async (id: string, input: ResolveConflictInput) =>
  syncConflict.parse(await api<unknown>(`/api/sync/conflicts/${id}/resolve`, { method: 'POST', body: resolveConflictInput.parse(input) }));

/** A person's decision on a kept conflict; the next pull brings the outcome to this phone. */
export function useResolveConflict() {
  return useMutation({
    mutationFn: ({ id, keep }: { id: string } & ResolveConflictInput) => resolveConflict(id, { keep }),
    onSuccess: async (resolved) => {
      await keepResolvedConflict(resolved);
      void syncNow();
    },
  });
}
