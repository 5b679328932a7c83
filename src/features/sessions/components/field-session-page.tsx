import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import type { Pose } from '@shared/schemas';
import { crossAxleTwistDeg } from '@shared/flex/twist';
import { useLocalSession } from '@/lib/db/live';
import { patchRecord, saveRecord, type ItemResult } from '@/lib/db/records';
import { SaveProblems } from '@/features/field/components/save-problems';
import { SafetyChecklist } from './safety-checklist';

/** One session in the field: its poses (twist, how many readings), and the way to record the next. */
export function FieldSessionPage() {
  const { id } = useParams();
  const data = useLocalSession(id);
  const navigate = useNavigate();
  const [safe, setSafe] = useState(false);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  if (data === undefined) return <p role="status">Loading…</p>;
  if (data === null) return <p role="alert">This session is not on this phone.</p>;
  const { session, vehicle, poses, readings } = data;

  const addPose = async () => {
    const seq = poses.length ? Math.max(...poses.map((p) => p.seq)) + 1 : 0;
    const first = !poses.some((p) => p.kind === 'level');
    const pose: Pose = {
      id: crypto.randomUUID(),
      version: 1,
      sessionId: session.id,
      seq,
      label: first ? 'Level' : `Pose ${seq}`,
      kind: first ? 'level' : 'wheels',
      liftFlMm: 0,
      liftFrMm: 0,
      liftRlMm: 0,
      liftRrMm: 0,
      rampAngleDeg: null,
      rampDistanceMm: null,
      notes: '',
      recordedAt: new Date().toISOString(),
    };
    const result = await saveRecord('pose', pose);
    if (result.ok) navigate(`/field/sessions/${session.id}/poses/${pose.id}`);
    else setProblems([result]);
  };

  const twist = (p: Pose) =>
    vehicle ? crossAxleTwistDeg({ fl: p.liftFlMm, fr: p.liftFrMm, rl: p.liftRlMm, rr: p.liftRrMm }, vehicle.trackFrontMm, vehicle.trackRearMm) : null;

  return (
    <section className="space-y-3">
      <h1 className="text-2xl font-bold">{vehicle?.name ?? 'Vehicle not on this phone'}</h1>
      <p>
        {session.testedOn} · {session.title || 'Flex test'} · {session.conditions}
      </p>
      {data.corrupt.length > 0 && <p role="alert" className="text-alert">Some stored records could not be read: {data.corrupt[0].message}</p>}
      {!session.safetyAckAt ? (
        <div className="space-y-2">
          <SafetyChecklist onAllTicked={setSafe} />
          <button type="button" className="btn-primary w-full" disabled={!safe} onClick={() => void patchRecord('testSession', session.id, { safetyAckAt: new Date().toISOString() }).then((r) => setProblems([r]))}>
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
                  <Link to={`/field/sessions/${session.id}/poses/${p.id}`} className="card flex min-h-touch flex-wrap gap-x-3 hover:border-slate">
                    <span className="font-bold">{p.label || `Pose ${p.seq}`}</span>
                    <span>{t == null ? '' : `twist ${t.toFixed(1)}°`}</span>
                    <span>{readings.filter((r) => r.poseId === p.id && !r.deletedAt).length} readings</span>
                  </Link>
                </li>
              );
            })}
          </ul>
          <button type="button" className="btn-primary w-full" onClick={() => void addPose()}>
            {poses.some((p) => p.kind === 'level') ? 'Record the next pose' : 'Record the level pose'}
          </button>
        </>
      )}
      <SaveProblems results={problems} />
    </section>
  );
}
