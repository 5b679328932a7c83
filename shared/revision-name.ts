// How an envelope revision is named and marked everywhere (desk, viewer's list, sheet, e-mail):
// it belongs to its session, so two sessions of one truck never both read "revision 1".
import type { EnvelopeStatus } from './schemas/envelope';

/** The state of a revision in words: the signed one stands ("current"). */
export const REVISION_STATE_NAMES: Record<EnvelopeStatus, string> = { signed: 'current', draft: 'draft', superseded: 'superseded' };

/**
 * A revision's name: `revisionName({ vehicleName: 'TC-14', sessionTitle: 'Yard flex test', revision: 2 })
 * // => 'TC-14 · Yard flex test · revision 2'`.
 */
export function revisionName(e: { vehicleName: string; sessionTitle: string; revision: number }): string {
  return `${e.vehicleName} · ${e.sessionTitle} · revision ${e.revision}`;
}
