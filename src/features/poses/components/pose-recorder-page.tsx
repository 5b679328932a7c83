import { useEffect, useRef, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { axes, liftKeyOf, pose as poseSchema, wheels, type Axis, type Pose, type Wheel } from '@shared/schemas';
import { useLocalSession, type LocalSession } from '@/lib/db/live';
import { FieldRetests } from '@/components/retest-requests';
import { patchRecord, setReadingValue, type ItemResult } from '@/lib/db/records';
import { useWritesInFlight } from '@/lib/db/writes-in-flight';
import { LengthInput, limitsOf } from '@/components/field/length-input';
import { AngleInput } from '@/components/field/angle-input';
import { UnitToggle } from '@/components/field/unit-toggle';
import { SaveProblems } from '@/components/field/save-problems';
import { useFieldUnit } from '@/lib/field/use-field-unit';
import { focusNextEntry } from '@/lib/field/entry-order';
import { addPose, deletePose, nextPose, repeatOf, type DeletedPose } from '@/lib/field/pose-actions';
import { showLength } from '@/lib/field/parse-length';
import { TruckTopView, WHEEL_NAMES } from './truck-top-view';
import { checkPose, PoseCheck } from './pose-check';
import { PhotoCapture } from './photo-capture';
import { liftDoubt, readingDoubt } from '../plausible';
import { rampPatch, USUAL_RAMP_DEG, type RampState } from '../ramp';
import { pathTo } from '@/paths';

const axisLabel: Record<Axis, string> = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' };
const RAMP_LIMITS = limitsOf(poseSchema.shape.rampDistanceMm.unwrap());

/**
 * One pose: which wheels are lifted (tap a wheel on the top view) or a ramp, a reading per gauge
 * point and axis, notes and photos, then on to the next pose. Every value is saved on the phone as
 * it is typed, as a patch of the stored pose; the twist and a rough fit update at once and flag a
 * reading that disagrees with the rest.
 */
export function PoseRecorderPage() {
  const { id: sessionId, poseId } = useParams();
  const data = useLocalSession(sessionId);
  if (data === undefined) return <p role="status">Loading…</p>;
  const pose = data?.poses.find((p) => p.id === poseId);
  if (!data || !pose) return <p role="alert">This pose is not on this phone.</p>;
  if (!data.vehicle) return <p role="alert">The vehicle of this session is not on this phone: sync while online.</p>;
  // A new pose is a new page: inputs start from its own stored values.
  return <PoseRecorder key={pose.id} data={data as LocalSession & { vehicle: NonNullable<LocalSession['vehicle']> }} pose={pose} />;
}

function PoseRecorder({ data, pose }: { data: LocalSession & { vehicle: NonNullable<LocalSession['vehicle']> }; pose: Pose }) {
  const navigate = useNavigate();
  const [unit, setUnit] = useFieldUnit();
  const [wheel, setWheel] = useState<Wheel | null>(null);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  const liftInputs = useRef<Record<Wheel, HTMLDivElement | null>>({ fl: null, fr: null, rl: null, rr: null });
  // The ramp's three values as last typed here: each change writes all three with the lift that
  // follows from them, and must not build on a live read that is a keystroke behind.
  const ramp = useRef<RampState>({ rampAngleDeg: pose.rampAngleDeg, rampDistanceMm: pose.rampDistanceMm, rampWheel: pose.rampWheel });
  useEffect(() => {
    // A new pose starts at its top. (Block body: newer browsers return a promise from scrollTo,
    // which React would take for a cleanup.)
    window.scrollTo(0, 0);
  }, []);

  const { session, vehicle, gaugePoints, readings, poses } = data;
  const report = (r: ItemResult) => setProblems((prev) => [...prev.filter((p) => p.id !== r.id), r]);
  const patch = async (fields: Partial<Pose>) => report(await patchRecord('pose', pose.id, fields));
  const setRamp = (change: Partial<RampState>, extra: Partial<Pose> = {}) => {
    const after = { ...ramp.current, ...change };
    const fields = { ...rampPatch(ramp.current, after), ...extra };
    ramp.current = after;
    void patch(fields);
  };
  const chooseKind = (kind: Pose['kind']) => {
    if (kind !== 'ramp') return void patch({ kind });
    setRamp({ rampAngleDeg: ramp.current.rampAngleDeg ?? USUAL_RAMP_DEG, rampDistanceMm: ramp.current.rampDistanceMm ?? 0 }, { kind });
  };

  const own = readings.filter((r) => r.poseId === pose.id && !r.deletedAt);
  const baselinePose = poses.find((p) => p.kind === 'level' && p.id !== pose.id);
  const baseline = baselinePose ? readings.filter((r) => r.poseId === baselinePose.id && !r.deletedAt) : null;
  const check = checkPose(vehicle, session, gaugePoints, pose, own, baseline);
  const value = (pointId: string, axis: Axis) => own.find((r) => r.gaugePointId === pointId && r.axis === axis)?.valueMm ?? null;
  const rampWheel = pose.kind === 'ramp' ? pose.rampWheel : null;
  const later = poses.find((p) => p.seq > pose.seq);

  const goNext = async () => {
    if (later) return navigate(pathTo('fieldPose', { id: session.id, poseId: later.id }));
    const next = nextPose(session.id, poses);
    const result = await addPose(next);
    if (result.ok) navigate(pathTo('fieldPose', { id: session.id, poseId: next.id }));
    else report(result);
  };
  const repeat = async () => {
    const again = repeatOf(pose, poses);
    const result = await addPose(again);
    if (result.ok) navigate(pathTo('fieldPose', { id: session.id, poseId: again.id }));
    else report(result);
  };
  const remove = async () => {
    const result = await deletePose(pose.id);
    if (!result.ok) return report(result);
    const deleted: DeletedPose = {
      id: pose.id,
      label: pose.label || `Pose ${pose.seq}`,
      wasBaseline: pose.kind === 'level' && !poses.some((p) => p.kind === 'level' && p.seq < pose.seq),
    };
    navigate(pathTo('fieldSession', { id: session.id }), { state: { deleted } });
  };

  // The order of the entries below is the order Enter / Next walks (entry-order.ts): the pose's
  // name, then how it is set up (the ramp's angle and distance, the wheel lifts front to rear,
  // left to right), then the readings point by point in label order with each point's three axes
  // in turn, since a tester reads all three at one mark before moving the tape to the next, and
  // last the notes.
  return (
    <section className="space-y-4">
      <nav>
        <Link to={pathTo('fieldSession', { id: session.id })} className="inline-flex min-h-touch items-center font-bold underline">
          ← {vehicle.name}, all poses
        </Link>
      </nav>
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">{pose.label || `Pose ${pose.seq}`}</h1>
        <UnitToggle unit={unit} onChange={setUnit} />
      </div>
      <FieldRetests
        sessionId={session.id}
        poseId={pose.id}
        look={{ pose: (pid) => poses.find((p) => p.id === pid), point: (gid) => gaugePoints.find((g) => g.id === gid) }}
      />
      <div>
        <label htmlFor="pose-name" className="field-label">
          Pose name
        </label>
        <input
          id="pose-name"
          data-entry=""
          className="input"
          enterKeyHint="next"
          defaultValue={pose.label}
          onFocus={(e) => e.currentTarget.select()}
          onKeyDown={(e) => {
            if (e.key !== 'Enter') return;
            e.preventDefault();
            focusNextEntry(e.currentTarget);
          }}
          onChange={(e) => void patch({ label: e.target.value })}
        />
      </div>
      <fieldset>
        <legend className="field-label">Kind</legend>
        <div className="flex flex-wrap gap-2">
          {(['level', 'wheels', 'ramp'] as const).map((k) => (
            <button key={k} type="button" aria-pressed={pose.kind === k} className={pose.kind === k ? 'btn-primary' : 'btn'} onClick={() => chooseKind(k)}>
              {k === 'level' ? 'Level' : k === 'wheels' ? 'Wheels lifted' : 'Ramp'}
            </button>
          ))}
        </div>
      </fieldset>

      {pose.kind === 'ramp' && (
        <section aria-label="Ramp" className="card space-y-3">
          <fieldset>
            <legend className="field-label">Which wheel is on the ramp?</legend>
            <div className="grid grid-cols-2 gap-2">
              {wheels.map((w) => (
                <button
                  key={w}
                  type="button"
                  aria-pressed={rampWheel === w}
                  className={rampWheel === w ? 'btn-primary' : 'btn'}
                  onClick={() => setRamp({ rampWheel: w })}
                >
                  {WHEEL_NAMES[w][0].toUpperCase() + WHEEL_NAMES[w].slice(1)}
                </button>
              ))}
            </div>
          </fieldset>
          <div className="grid grid-cols-2 gap-3">
            <AngleInput label="Ramp angle" valueDeg={pose.rampAngleDeg} onChange={(deg) => setRamp({ rampAngleDeg: deg })} />
            <LengthInput
              label="Distance up the ramp"
              unit={unit}
              valueMm={pose.rampDistanceMm}
              limits={RAMP_LIMITS}
              onChange={(mm) => mm != null && setRamp({ rampDistanceMm: mm })}
            />
          </div>
          <p data-testid="ramp-lift" role="status">
            {rampWheel
              ? `Lift ${WHEEL_NAMES[rampWheel]}: ${showLength(pose[liftKeyOf[rampWheel]], unit)} ${unit}, from the distance up the ramp × sin(angle).`
              : 'Choose the wheel on the ramp: its lift then follows from the distance and the angle.'}
          </p>
        </section>
      )}

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
        {wheels.map((w) => (
          <div key={w} ref={(el) => void (liftInputs.current[w] = el)} className={wheel === w ? 'rounded-lg ring-4 ring-signal' : ''}>
            {w === rampWheel ? (
              <p className="text-sm font-bold">
                Lift {WHEEL_NAMES[w]} ({unit})
                <span className="mt-1 block min-h-touch rounded-lg border-2 border-rule bg-paper px-3 py-2 text-2xl font-normal tabular-nums">
                  {showLength(pose[liftKeyOf[w]], unit)}
                </span>
                <span className="font-normal">on the ramp</span>
              </p>
            ) : (
              <LengthInput
                label={`Lift ${WHEEL_NAMES[w]}`}
                unit={unit}
                valueMm={pose[liftKeyOf[w]]}
                allowEmpty
                doubt={(mm) => liftDoubt(mm, w[0] === 'f' ? vehicle.trackFrontMm : vehicle.trackRearMm, unit)}
                onChange={(mm) => void patch({ [liftKeyOf[w]]: mm ?? 0 })}
              />
            )}
          </div>
        ))}
      </div>

      <PoseCheck check={check} points={gaugePoints} unit={unit} />

      <h2 className="text-xl font-bold">Readings ({session.readingMode === 'gap' ? 'gaps' : 'displacements'})</h2>
      {gaugePoints.length === 0 && (
        <p>
          This vehicle has no gauge points yet.{' '}
          <Link className="underline" to={pathTo('vehicle', { id: vehicle.id })}>
            Place them
          </Link>
          .
        </p>
      )}
      <div className="space-y-3">
        {/* A form per point: the browser's autofill looks over every field of the form a typed-in
            field belongs to (with no form, every field of the page) after each keystroke. Points
            off screen are neither laid out nor painted. Both keep the main thread free to take
            the keystroke's answer from IndexedDB. */}
        {gaugePoints.map((g) => (
          <form key={g.id} noValidate onSubmit={(e) => e.preventDefault()} className="[contain-intrinsic-size:auto_14rem] [content-visibility:auto]">
            <fieldset className="card space-y-2 p-3">
              <legend className="px-1 text-lg font-bold">Point {g.label}</legend>
              {axes.map((a) => (
                <LengthInput
                  key={a}
                  layout="row"
                  allowEmpty
                  label={`${g.label} ${axisLabel[a]}`}
                  unit={unit}
                  valueMm={value(g.id, a)}
                  warn={check.suspect.has(`${g.id}|${a}`)}
                  doubt={(mm) => readingDoubt(mm, a, session.readingMode, vehicle, unit)}
                  onChange={(mm) => void setReadingValue({ poseId: pose.id, gaugePointId: g.id, axis: a }, mm).then(report)}
                />
              ))}
            </fieldset>
          </form>
        ))}
      </div>
      <div>
        <label htmlFor="pose-notes" className="field-label">
          Notes
        </label>
        <textarea
          id="pose-notes"
          data-entry=""
          className="input min-h-24 py-2"
          defaultValue={pose.notes}
          onChange={(e) => void patch({ notes: e.target.value })}
        />
      </div>
      <PhotoCapture sessionId={session.id} poseId={pose.id} />
      <SaveProblems results={problems} />
      <LocalSaveState />
      <button type="button" className="btn-primary w-full flex-col gap-0" onClick={() => void goNext()}>
        Next pose
        <span className="text-sm font-normal">{later ? later.label || `Pose ${later.seq}` : 'a new pose'}</span>
      </button>
      <div className="grid grid-cols-2 gap-2">
        <button type="button" className="btn" onClick={() => void repeat()}>
          Repeat this pose
        </button>
        <button type="button" className="btn border-alert text-alert" onClick={() => void remove()}>
          Delete pose
        </button>
      </div>
    </section>
  );
}

/**
 * Whether everything typed is stored yet. A component of its own: each keystroke's write starts
 * and settles here without the recorder and its entries rendering again.
 */
function LocalSaveState() {
  const saving = useWritesInFlight();
  return (
    <p className="text-sm" role="status" data-testid="local-save-state">
      {saving > 0 ? 'Saving on this phone…' : 'Everything typed is saved on this phone.'}
    </p>
  );
}
