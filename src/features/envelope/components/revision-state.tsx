import type { EnvelopeStatus } from '@shared/schemas/envelope';
import { REVISION_STATE_NAMES } from '@shared/revision-name';

const STYLE: Record<EnvelopeStatus, string> = {
  signed: 'bg-good-light text-good',
  draft: 'bg-signal/20 text-signal-dark',
  superseded: 'bg-alert-light text-alert',
};

/** Whether a revision stands (current), is being worked on (draft) or was replaced (superseded). */
export function RevisionState({ status }: { status: EnvelopeStatus }) {
  return <span className={`rounded px-1 text-sm font-bold ${STYLE[status]}`}>{REVISION_STATE_NAMES[status]}</span>;
}
