import { useMemo } from 'react';
import { FlexInputError, designEnvelope, type EnvelopeResult } from '@shared/flex';
import { poseKeys, toEnvelopeInput, type DeskSessionData } from '@shared/desk-envelope';
import { DEFAULT_DRAFT_PARAMS } from '@shared/schemas/envelope';

export interface FitFlag {
  residualMm: number;
  modifiedZ: number | null;
}

/**
 * The session's per-pose fits, and the readings the relative-motion fit finds far from the others (robust z-score of the residuals,
 * see shared/flex/relative-motion.ts), by reading id. The fit does not depend on the design
 * parameters, so the defaults only complete the computation's input. Excluded readings are not fitted.
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
    const keyToPose = new Map([...poseKeys(data.poses)].map(([id, key]) => [key, id]));
    const labelToPoint = new Map(data.gaugePoints.map((g) => [g.label, g.id]));
    const readingAt = new Map(data.readings.filter((r) => !r.excluded).map((r) => [`${r.poseId}|${r.gaugePointId}|${r.axis}`, r.id]));
    for (const pose of result.poses) {
      for (const o of pose.fit?.outliers ?? []) {
        const id = readingAt.get(`${keyToPose.get(pose.poseId)}|${labelToPoint.get(o.pointId)}|${o.axis}`);
        if (id) flags.set(id, { residualMm: o.residual, modifiedZ: o.modifiedZ });
      }
    }
    return { result, flags, error: null };
  }, [data]);
}
