// Comparison across sessions and vehicles (brief step 9): per session the twist reached, the worst
// perimeter displacement per axis and the slope in mm per degree of twist, from the readings in use
// now (excluded readings left out), with compareSessions of shared/flex.
import type { AuthContext } from '../auth/context';
import { Invalid } from '../http/errors';
import { FlexInputError, compareSessions, poseSummaries } from '../../shared/flex';
import { computeDeskEnvelope } from '../../shared/desk-envelope';
import { DEFAULT_DRAFT_PARAMS, type ComparedSession } from '../../shared/schemas/envelope';
import { getSessionDetail } from './sessions.service';

export async function compare(auth: Pick<AuthContext, 'teamId'>, sessionIds: string[]): Promise<ComparedSession[]> {
  const unique = [...new Set(sessionIds)];
  const details = await Promise.all(unique.map((id) => getSessionDetail(auth, id)));
  const rows = details.map((detail) => {
    try {
      // Pose results (twist, fit, perimeter worst) do not depend on the design parameters; the
      // defaults only satisfy the computation's input.
      const { result } = computeDeskEnvelope(detail, DEFAULT_DRAFT_PARAMS);
      return { detail, poses: poseSummaries(result) };
    } catch (error) {
      if (error instanceof FlexInputError) {
        throw new Invalid(`session "${detail.session.title || detail.session.testedOn}" of ${detail.vehicle.name} cannot be compared: ${error.message}`);
      }
      throw error;
    }
  });
  const compared = compareSessions(rows.map(({ detail, poses }) => ({ sessionId: detail.session.id, vehicleId: detail.vehicle.id, poses })));
  return compared.map((c, i) => {
    const { detail } = rows[i];
    return {
      sessionId: c.sessionId,
      vehicleId: detail.vehicle.id,
      vehicleName: detail.vehicle.name,
      title: detail.session.title,
      testedOn: detail.session.testedOn,
      poseCount: c.poseCount,
      twistReachedDeg: c.twistReachedDeg,
      worstMm: c.worstMm,
      slopeMmPerDeg: c.slopeMmPerDeg,
    };
  });
}
