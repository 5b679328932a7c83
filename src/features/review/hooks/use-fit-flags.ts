import { useMemo } from 'react';
import { FlexInputError, designEnvelope, type EnvelopeFlag, type EnvelopeResult } from '@shared/flex';
import { deskFlags, toEnvelopeInput, type DeskSessionData } from '@shared/desk-envelope';
import { DEFAULT_DRAFT_PARAMS } from '@shared/schemas/envelope';

export type FitFlag = EnvelopeFlag;

/**
 * The session's per-pose fits, the readings the outlier rule flags (their deleted residual judged
 * against the reading resolution, see docs/method.md §3), by reading id, and the remarks on the
 * readings and the fit. The fit does not depend on the design parameters, so the defaults only
 * complete the computation's input. Excluded readings are not fitted.
 */
export function useFitFlags(data: DeskSessionData): { result: EnvelopeResult | null; flags: Map<string, FitFlag>; error: string | null } {
  return useMemo(() => {
    const flags = new Map<string, FitFlag>();
    let result: EnvelopeResult;
    try {
      result = designEnvelope(toEnvelopeInput(data, DEFAULT_DRAFT_PARAMS));
    } catch (error) {
      if (error instanceof FlexInputError) return { result: null, flags, error: error.message };
      throw error;
    }
    for (const f of deskFlags(data, result)) flags.set(f.readingId, f.flag);
    return { result, flags, error: null };
  }, [data]);
}
