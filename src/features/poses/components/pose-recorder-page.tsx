import { useEffect, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { axes, type Axis, type Pose } from '@shared/schemas';
import { useLocalSession } from '@/lib/db/live';
import { patchRecord, setReadingValue, type ItemResult, type Patch } from '@/lib/db/records';
import { useWritesInFlight } from '@/lib/db/writes-in-flight';
import { LengthInput } from '@/features/field/components/length-input';
import { UnitToggle } from '@/features/field/components/unit-toggle';
import { SaveProblems } from '@/features/field/components/save-problems';
import { useFieldUnit } from '@/features/field/hooks/use-field-unit';
import { TruckTopView, WHEEL_NAMES, type Wheel } from './truck-top-view';
import { checkPose, PoseCheck } from './pose-check';
import { PhotoCapture } from './photo-capture';

const axisLabel: Record<Axis, string> = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' };
const liftKey: Record<Wheel, 'liftFlMm' | 'liftFrMm' | 'liftRlMm' | 'liftRrMm'> = { fl: 'liftFlMm', fr: 'liftFrMm', rl: 'liftRlMm', rr: 'liftRrMm' };

/**
 * One pose: wheel lifts (tap a wheel on the top view) or a ramp, a reading per gauge point and
 * axis, notes and photos. Every value is saved on the phone as it is typed; the twist and a rough
 * fit update at once and flag a reading that disagrees with the rest.
 */
export function PoseRecorderPage() {
  const { id: sessionId, poseId } = useParams();
  const data = useLocalSession(sessionId);
  const [unit, setUnit] = useFieldUnit();
  const saving = useWritesInFlight();
  const [wheel, setWheel] = useState<Wheel | null>(null);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  const liftInputs = useRef<Record<Wheel, HTMLDivElement | null>>({ fl: null, fr: null, rl: null, rr: null });
  // Edits build on the latest pose typed here, not on a live read that may lag a keystroke behind.
  const latest = useRef<Pose | null>(null);
  const stored = data?.poses.find((p) => p.id === poseId) ?? null;
  useEffect(() => {
    if (stored && (!latest.current || latest.current.id !== stored.id)) latest.current = stored;
  }, [stored]);

  if (data === undefined) return <p role="status">Loading…</p>;
  const pose = latest.current?.id === poseId ? latest.current : stored;
  if (!data || !pose) return <p role="alert">This pose is not on this phone.</p>;
  const { session, vehicle, gaugePoints, readings, poses } = data;
  if (!vehicle) return <p role="alert">The vehicle of this session is not on this phone: sync while online.</p>;

  const report = (r: ItemResult) => setProblems((prev) => [...prev.filter((p) => p.id !== r.id), r]);
  const savePose = async (patch: Patch<'pose'>) => {
    // The screen shows the edit at once; storage merges only the changed fields into the stored pose.
    latest.current = { ...(latest.current?.id === pose.id ? latest.current : pose), ...patch };
    report(await patchRecord('pose', pose.id, patch));
  };
  const own = readings.filter((r) => r.poseId === pose.id && !r.deletedAt);
  const baselinePose = poses.find((p) => p.kind === 'level' && p.id !== pose.id);
  const baseline = baselinePose ? readings.filter((r) => r.poseId === baselinePose.id && !r.deletedAt) : null;
  const check = checkPose(vehicle, session, gaugePoints, pose, own, baseline);
  const value = (pointId: string, axis: Axis) => own.find((r) => r.gaugePointId === pointId && r.axis === axis)?.valueMm ?? null;

  return (
    <section className="space-y-4">
      <nav>
        <Link to={`/field/sessions/${session.id}`} className="inline-flex min-h-touch items-center font-bold underline">
          ← {vehicle.name}, all poses
        </Link>
      </nav>
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">{pose.label || `Pose ${pose.seq}`}</h1>
        <UnitToggle unit={unit} onChange={setUnit} />
      </div>
      <div>
        <label htmlFor="pose-name" className="field-label">
          Pose name
        </label>
        <input id="pose-name" className="input" value={pose.label} onChange={(e) => void savePose({ label: e.target.value })} />
      </div>
      <fieldset>
        <legend className="field-label">Kind</legend>
        <div className="flex gap-2">
          {(['level', 'wheels', 'ramp'] as const).map((k) => (
            <button
              key={k}
              type="button"
              aria-pressed={pose.kind === k}
              className={pose.kind === k ? 'btn-primary' : 'btn'}
              onClick={() => void savePose(k === 'ramp' ? { kind: k, rampAngleDeg: pose.rampAngleDeg ?? 20, rampDistanceMm: pose.rampDistanceMm ?? 0 } : { kind: k })}
            >
              {k === 'level' ? 'Level' : k === 'wheels' ? 'Wheels lifted' : 'Ramp'}
            </button>
          ))}
        </div>
      </fieldset>

      <TruckTopView
        unit={unit}
        selected={wheel}
        lifts={{ fl: pose.liftFlMm, fr: pose.liftFrMm, rl: pose.liftRlMm, rr: pose.liftRrMm }}
        onSelect={(w) => {
          setWheel(w);
          liftInputs.current[w]?.querySelector('input')?.focus();
        }}
      />
      <div className="grid grid-cols-2 gap-3">
        {(['fl', 'fr', 'rl', 'rr'] as const).map((w) => (
          <div key={w} ref={(el) => void (liftInputs.current[w] = el)} className={wheel === w ? 'rounded-lg ring-4 ring-signal' : ''}>
            <LengthInput label={`Lift ${WHEEL_NAMES[w]}`} unit={unit} valueMm={pose[liftKey[w]]} onChange={(mm) => void savePose({ [liftKey[w]]: mm ?? 0 })} allowEmpty compact />
          </div>
        ))}
      </div>
      {pose.kind === 'ramp' && (
        <div className="grid grid-cols-2 gap-3">
          <label className="block">
            <span className="field-label">Ramp angle (°)</span>
            <input
              className="input text-2xl"
              inputMode="decimal"
              defaultValue={pose.rampAngleDeg ?? 20}
              onChange={(e) => {
                const v = Number(e.target.value.replace(',', '.'));
                if (v > 0 && v < 90) void savePose({ rampAngleDeg: v });
              }}
            />
          </label>
          <LengthInput label="Distance up the ramp" unit={unit} valueMm={pose.rampDistanceMm} onChange={(mm) => void savePose({ rampDistanceMm: mm ?? 0 })} compact />
        </div>
      )}

      <PoseCheck check={check} points={gaugePoints} unit={unit} />

      <h2 className="text-xl font-bold">Readings ({session.readingMode === 'gap' ? 'gaps' : 'displacements'})</h2>
      {gaugePoints.length === 0 && (
        <p>
          This vehicle has no gauge points yet. <Link className="underline" to={`/field/vehicles/${vehicle.id}`}>Place them</Link>.
        </p>
      )}
      <div className="space-y-3">
        {gaugePoints.map((g) => (
          <fieldset key={g.id} className="card">
            <legend className="px-1 text-lg font-bold">Point {g.label}</legend>
            <div className="grid grid-cols-3 gap-2">
              {axes.map((a) => (
                <LengthInput
                  key={a}
                  compact
                  allowEmpty
                  label={`${g.label} ${axisLabel[a]}`}
                  unit={unit}
                  valueMm={value(g.id, a)}
                  warn={check.suspect.has(`${g.id}|${a}`)}
                  onChange={(mm) => void setReadingValue({ poseId: pose.id, gaugePointId: g.id, axis: a }, mm).then(report)}
                />
              ))}
            </div>
          </fieldset>
        ))}
      </div>
      <div>
        <label htmlFor="pose-notes" className="field-label">
          Notes
        </label>
        <textarea id="pose-notes" className="input min-h-24 py-2" defaultValue={pose.notes} onChange={(e) => void savePose({ notes: e.target.value })} />
      </div>
      <PhotoCapture sessionId={session.id} poseId={pose.id} />
      <SaveProblems results={problems} />
      <p className="text-sm" role="status" data-testid="local-save-state">
        {saving > 0 ? 'Saving on this phone…' : 'Everything typed is saved on this phone.'}
      </p>
    </section>
  );
}
