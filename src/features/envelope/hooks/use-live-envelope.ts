import { useMemo } from 'react';
import { FlexInputError } from '@shared/flex';
import { computeDeskEnvelope, type DeskEnvelope, type DeskSessionData } from '@shared/desk-envelope';
import type { EnvelopeParams } from '@shared/schemas/envelope';

/**
 * The envelope recomputed in the browser with shared/flex as the engineer types: the same code the
 * server runs at sign-off. Input the computation cannot use comes back as its message.
 */
export function useLiveEnvelope(data: DeskSessionData, params: EnvelopeParams | null): { envelope: DeskEnvelope | null; error: string | null } {
  return useMemo(() => {
    if (params === null) return { envelope: null, error: null };
    try {
      return { envelope: computeDeskEnvelope(data, params), error: null };
    } catch (error) {
      if (error instanceof FlexInputError) return { envelope: null, error: error.message };
      throw error;
    }
  }, [data, params]);
}
