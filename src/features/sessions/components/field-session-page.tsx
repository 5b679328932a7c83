import { useState } from 'react';
import { Link, useLocation, useNavigate, useParams } from 'react-router-dom';
import type { Pose, TestSession } from '@shared/schemas';
import { crossAxleTwistDeg } from '@shared/flex/twist';
import { useLocalSession } from '@/lib/db/live';
import { patchRecord, type ItemResult } from '@/lib/db/records';
import { SaveProblems } from '@/components/field/save-problems';
import { addPose, nextPose, restorePose, type DeletedPose } from '@/lib/field/pose-actions';
import { FieldRetests } from '@/components/retest-requests';
import { SafetyChecklist } from './safety-checklist';
import { SessionFields, type SessionDetails } from './session-fields';
import { pathTo } from '@/paths';

const detailsOf = (s: TestSession): SessionDetails => ({
  title: s.title,
  testedOn: s.testedOn,
  conditions: s.conditions,
  loadState: s.loadState,
  tyrePressures: s.tyrePressures,
  crew: s.crew,
  notes: s.notes,
});

/** One session in the field: its details (editable), its poses (twist, how many readings), and the way to record the next. */
export function FieldSessionPage() {
  const { id } = useParams();
  const data = useLocalSession(id);
  const navigate = useNavigate();
  const location = useLocation();
  const [safe, setSafe] = useState(false);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  const [editing, setEditing] = useState<SessionDetails | null>(null);
  const [deleted, setDeleted] = useState<DeletedPose | null>((location.state as { deleted?: DeletedPose } | null)?.deleted ?? null);
  if (data === undefined) return <p role="status">Loading…</p>;
  if (data === null) return <p role="alert">This session is not on this phone.</p>;
  const { session, vehicle, poses, readings } = data;
  const report = (r: ItemResult) => setProblems((prev) => [...prev.filter((p) => p.id !== r.id), r]);

  const recordPose = async () => {
    const pose = nextPose(session.id, poses);
    const result = await addPose(pose);
    if (result.ok) navigate(pathTo('fieldPose', { id: session.id, poseId: pose.id }));
    else report(result);
  };
  const undoDelete = async () => {
    if (!deleted) return;
    const result = await restorePose(deleted.id);
    report(result);
    if (result.ok) setDeleted(null);
  };
  const edit = (patch: Partial<SessionDetails>) => {
    setEditing((d) => (d ? { ...d, ...patch } : d));
    void patchRecord('testSession', session.id, patch).then(report);
  };

  const twist = (p: Pose) =>
    vehicle ? crossAxleTwistDeg({ fl: p.liftFlMm, fr: p.liftFrMm, rl: p.liftRlMm, rr: p.liftRrMm }, vehicle.trackFrontMm, vehicle.trackRearMm) : null;
  const hasReadings = readings.some((r) => !r.deletedAt);

  return (
    <section className="space-y-3">
      <h1 className="text-2xl font-bold">{vehicle?.name ?? 'Vehicle not on this phone'}</h1>
      {editing ? (
        <section aria-label="Session details" className="card space-y-3">
          <h2 className="text-xl font-bold">Session details</h2>
          <SessionFields value={editing} onChange={edit} />
          <p className="text-sm">
            Readings are entered as {session.readingMode === 'gap' ? 'raw gaps (baseline subtracted)' : 'displacements'}
            {hasReadings ? ': fixed once readings are taken, since every reading depends on it.' : '.'}
          </p>
          {!hasReadings && (
            <button
              type="button"
              className="btn"
              onClick={() => void patchRecord('testSession', session.id, { readingMode: session.readingMode === 'gap' ? 'displacement' : 'gap' }).then(report)}
            >
              Enter readings as {session.readingMode === 'gap' ? 'displacements' : 'raw gaps'} instead
            </button>
          )}
          <button type="button" className="btn-primary w-full" onClick={() => setEditing(null)}>
            Done
          </button>
        </section>
      ) : (
        <div className="flex flex-wrap items-start gap-2">
          <p className="mr-auto">
            {session.testedOn} · {session.title || 'Flex test'}
            {session.conditions && ` · ${session.conditions}`}
          </p>
          <button type="button" className="btn" onClick={() => setEditing(detailsOf(session))}>
            Edit details
          </button>
        </div>
      )}
      {data.corrupt.length > 0 && (
        <p role="alert" className="text-alert">
          Some stored records could not be read: {data.corrupt[0].message}
        </p>
      )}
      {deleted && (
        <div role="status" className="flex flex-wrap items-center gap-2 rounded-lg border-2 border-signal-dark bg-signal/15 p-3">
          <p className="mr-auto font-bold">
            Pose “{deleted.label}” deleted.
            {deleted.wasBaseline && ' It was the baseline: the gaps of the other poses have none until you undo or record a level pose.'}
          </p>
          <button type="button" className="btn" onClick={() => void undoDelete()}>
            Undo
          </button>
        </div>
      )}
      <FieldRetests
        sessionId={session.id}
        look={{ pose: (pid) => poses.find((p) => p.id === pid), point: (gid) => data.gaugePoints.find((g) => g.id === gid) }}
        poseLink={(pid) => (
          <Link className="btn" to={pathTo('fieldPose', { id: session.id, poseId: pid })}>
            Open the pose
          </Link>
        )}
      />
      {!session.safetyAckAt ? (
        <div className="space-y-2">
          <SafetyChecklist onLeftChange={(left) => setSafe(left === 0)} />
          <button
            type="button"
            className="btn-primary w-full"
            disabled={!safe}
            onClick={() => void patchRecord('testSession', session.id, { safetyAckAt: new Date().toISOString() }).then(report)}
          >
            Checklist done
          </button>
        </div>
      ) : (
        <>
          <h2 className="text-xl font-bold">Poses</h2>
          {poses.length === 0 && <p>Start with the level pose: it is the baseline for every other pose.</p>}
          <ul className="space-y-2">
            {poses.map((p) => {
              const t = twist(p);
              return (
                <li key={p.id}>
                  <Link to={pathTo('fieldPose', { id: session.id, poseId: p.id })} className="card flex min-h-touch flex-wrap gap-x-3 hover:border-slate">
                    <span className="font-bold">{p.label || `Pose ${p.seq}`}</span>
                    <span>{t == null ? '' : `twist ${t.toFixed(1)}°`}</span>
                    <span>{readings.filter((r) => r.poseId === p.id && !r.deletedAt).length} readings</span>
                  </Link>
                </li>
              );
            })}
          </ul>
          <button type="button" className="btn-primary w-full" onClick={() => void recordPose()}>
            {poses.some((p) => p.kind === 'level') ? 'Record the next pose' : 'Record the level pose'}
          </button>
        </>
      )}
      <SaveProblems results={problems} />
    </section>
  );
}
