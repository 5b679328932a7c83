// Re-test requests on screen, the same at the desk and in the field: what each asks about, the
// engineer's comment, where it stands and the crew's answer; the crew answers an open one, the
// engineer closes or asks again. Every step is a change of the record on this device, sent with
// the next sync (src/lib/field/retest-actions.ts).
import { useId, useState, type ReactNode } from 'react';
import type { RetestRequest } from '@shared/schemas';
import { formatTimestamp } from '@shared/format';
import { RETEST_STATE_WORDS, retestTargetWords } from '@shared/retest-words';
import { answerRetest, askRetest, closeRetest, reopenRetest, type RetestTarget } from '@/lib/field/retest-actions';
import type { ItemResult } from '@/lib/db/records';
import { useLocalRetests } from '@/lib/db/live';
import { useMe } from '@/lib/auth/get-me';
import { useCan } from '@/lib/auth/can';
import { plural } from '@shared/plural';

export interface RetestLookups {
  pose: (id: string) => { label: string; seq: number } | undefined;
  point: (id: string) => { label: string } | undefined;
}

interface ListProps {
  requests: RetestRequest[];
  look: RetestLookups;
  /** The signed-in person's id: who answers or closes. */
  me: string | undefined;
  canAnswer: boolean;
  canAsk: boolean;
  /** A person's name by id, where the screen knows the workshop's members. */
  nameOf?: (userId: string) => string | undefined;
  /** A link to the pose a request is about, where the screen offers one. */
  poseLink?: (poseId: string) => ReactNode;
  /** Shown when there is no request. */
  empty?: string;
}

const STATE_STYLE: Record<RetestRequest['state'], string> = {
  open: 'bg-signal/25 text-slate',
  answered: 'bg-paper text-slate border border-slate',
  closed: 'bg-rule text-slate',
};

/** Requests, each with its answer or the controls the person's role allows. */
export function RetestList({ requests, look, me, canAnswer, canAsk, nameOf, poseLink, empty }: ListProps) {
  if (requests.length === 0) return empty ? <p className="text-sm">{empty}</p> : null;
  return (
    <ul className="space-y-2" aria-label="Re-test requests">
      {requests.map((r) => (
        <RetestItem key={r.id} request={r} look={look} me={me} canAnswer={canAnswer} canAsk={canAsk} nameOf={nameOf} poseLink={poseLink} />
      ))}
    </ul>
  );
}

function RetestItem({ request: r, look, me, canAnswer, canAsk, nameOf, poseLink }: Omit<ListProps, 'requests' | 'empty'> & { request: RetestRequest }) {
  const [problem, setProblem] = useState<string | null>(null);
  const target = retestTargetWords(r, look);
  const who = (id: string | null) => (id ? (id === me ? 'you' : (nameOf?.(id) ?? null)) : null);
  const byWhom = (id: string | null) => (who(id) ? ` by ${who(id)}` : '');
  const report = (result: ItemResult) => setProblem(result.ok ? null : `Not saved: ${result.message}`);
  return (
    <li className="card space-y-2" aria-label={`Re-test request on ${target}`}>
      <p className="flex flex-wrap items-center gap-2">
        <b>Re-test: {target}</b>
        <span className={`rounded px-2 text-sm font-bold ${STATE_STYLE[r.state]}`}>{RETEST_STATE_WORDS[r.state]}</span>
        {r.poseId && poseLink?.(r.poseId)}
      </p>
      <p>
        “{r.comment}” <span className="text-sm">— asked {formatTimestamp(r.askedAt)}</span>
      </p>
      {r.answeredAt && (
        <p>
          <b>{r.state === 'open' ? 'Earlier answer' : 'Answer'}:</b> “{r.answer}”{' '}
          <span className="text-sm">
            — {formatTimestamp(r.answeredAt)}
            {byWhom(r.answeredBy)}
          </span>
        </p>
      )}
      {r.closedAt && (
        <p className="text-sm">
          Closed {formatTimestamp(r.closedAt)}
          {byWhom(r.closedBy)}
        </p>
      )}
      {r.state === 'open' && canAnswer && me && <AnswerForm onAnswer={async (text) => report(await answerRetest(r.id, text, me))} />}
      {canAsk && me && (
        <div className="flex flex-wrap gap-2">
          {r.state !== 'closed' && (
            <button type="button" className="btn" onClick={async () => report(await closeRetest(r.id, me))}>
              Close request
            </button>
          )}
          {r.state !== 'open' && (
            <button type="button" className="btn" onClick={async () => report(await reopenRetest(r.id))}>
              Ask again
            </button>
          )}
        </div>
      )}
      {problem && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {problem}
        </p>
      )}
    </li>
  );
}

function AnswerForm({ onAnswer }: { onAnswer: (text: string) => Promise<void> }) {
  const [text, setText] = useState('');
  const id = useId();
  const empty = text.trim() === '';
  return (
    <div className="space-y-1">
      <label className="block" htmlFor={id}>
        <span className="field-label">Your answer</span>
      </label>
      <p className="text-sm">Measure again and type the new values on the pose as usual; say here what you did and found.</p>
      <textarea id={id} className="input min-h-24" value={text} maxLength={2_000} onChange={(e) => setText(e.target.value)} />
      <button
        type="button"
        className="btn-primary"
        disabled={empty}
        title={empty ? 'Type an answer first' : undefined}
        onClick={() => void onAnswer(text.trim())}
      >
        Send answer
      </button>
      {empty && <p className="text-sm">Type an answer first.</p>}
    </div>
  );
}

/** The engineer's "Ask for a re-test" on a session, a pose or a reading: a comment, kept on this device and sent with the next sync. */
export function AskRetest({ target, what }: { target: RetestTarget; what: string }) {
  const [open, setOpen] = useState(false);
  const [comment, setComment] = useState('');
  const [status, setStatus] = useState<{ ok: boolean; text: string } | null>(null);
  const id = useId();
  const empty = comment.trim() === '';
  if (!open)
    return (
      <span className="inline-flex flex-wrap items-center gap-2">
        <button
          type="button"
          className="btn"
          onClick={() => {
            setOpen(true);
            setStatus(null);
          }}
        >
          Ask for a re-test of {what}
        </button>
        {status && (
          <span role="status" className="text-sm">
            {status.text}
          </span>
        )}
      </span>
    );
  const send = async () => {
    const result = await askRetest(target, comment.trim());
    if (!result.ok) return setStatus({ ok: false, text: `Not saved: ${result.message}` });
    setOpen(false);
    setComment('');
    setStatus({ ok: true, text: 'Re-test request saved: it reaches the crew with the next sync.' });
  };
  return (
    <div className="space-y-1 text-left" role="group" aria-label={`Ask for a re-test of ${what}`}>
      <label className="block" htmlFor={id}>
        <span className="field-label">What should the crew measure again, and why? ({what})</span>
      </label>
      <textarea id={id} className="input min-h-24" value={comment} maxLength={1_000} onChange={(e) => setComment(e.target.value)} />
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          className="btn-primary"
          disabled={empty}
          title={empty ? 'Write what to measure again first' : undefined}
          onClick={() => void send()}
        >
          Send request
        </button>
        <button type="button" className="btn" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
      {status && !status.ok && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {status.text}
        </p>
      )}
    </div>
  );
}

/**
 * The field's view of a session's requests (all of them, or one pose's): those not yet closed, read
 * from this phone's store, so they show offline once a sync has brought them.
 */
export function FieldRetests({
  sessionId,
  poseId,
  look,
  poseLink,
}: {
  sessionId: string;
  poseId?: string;
  look: RetestLookups;
  poseLink?: ListProps['poseLink'];
}) {
  const data = useLocalRetests(sessionId);
  const me = useMe().data?.user.id;
  const can = useCan();
  if (!data) return null;
  const shown = data.requests.filter((r) => r.state !== 'closed' && (poseId === undefined || r.poseId === poseId));
  if (shown.length === 0) return null;
  const open = shown.filter((r) => r.state === 'open').length;
  return (
    <section aria-label="Re-test requests" className="space-y-2 rounded-lg border-2 border-signal-dark bg-signal/15 p-3">
      <h2 className="text-xl font-bold">Re-test requests{open > 0 && ` · ${plural(open, 'open request')}`}</h2>
      <RetestList requests={shown} look={look} me={me} canAnswer={can('retest.answer')} canAsk={false} poseLink={poseLink} />
    </section>
  );
}
