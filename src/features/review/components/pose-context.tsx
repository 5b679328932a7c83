import { useRef, useState } from 'react';
import type { Photo, Pose, TestSession } from '@shared/schemas';
import type { UnitSystem } from '@shared/schemas/common';
import { rampTravelIndex, roundRti } from '@shared/flex';
import { formatDeg, formatLength } from '@shared/format';

const THUMB_HEIGHT = 80;
const WHEEL_NAMES = { fl: 'front left (FL)', fr: 'front right (FR)', rl: 'rear left (RL)', rr: 'rear right (RR)' } as const;
const LIFT_KEYS = [
  ['fl', 'liftFlMm'],
  ['fr', 'liftFrMm'],
  ['rl', 'liftRlMm'],
  ['rr', 'liftRrMm'],
] as const;

/** What the crew wrote down about the outing: the conditions a reading is judged in. */
export function SessionConditions({ session }: { session: TestSession }) {
  const facts = [
    ['Conditions', session.conditions],
    ['Load', session.loadState],
    ['Tyre pressures', session.tyrePressures],
    ['Crew', session.crew],
    ['Notes', session.notes],
  ] as const;
  return (
    <section className="card" aria-label="Session conditions">
      <h2 className="font-bold">Session conditions</h2>
      <dl className="grid gap-x-4 gap-y-1 sm:grid-cols-[max-content_1fr]">
        {facts.map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="font-bold">{label}</dt>
            <dd>{value.trim() === '' ? <span className="text-slate">not recorded</span> : value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}

/** The wheels of a pose in words: each lift, and for a ramp which wheel is on it, how far and the RTI. */
export function poseWheelsText(pose: Pose, wheelbaseMm: number, unit: UnitSystem): string {
  const lifts = LIFT_KEYS.filter(([, key]) => pose[key] !== 0).map(
    ([wheel, key]) => `${WHEEL_NAMES[wheel]} ${pose[key] > 0 ? 'up' : 'down'} ${formatLength(Math.abs(pose[key]), unit)}`,
  );
  const wheels = lifts.length === 0 ? 'all wheels level' : lifts.join(', ');
  if (pose.kind !== 'ramp' || pose.rampAngleDeg == null || pose.rampDistanceMm == null) return wheels;
  const on = pose.rampWheel ? `${WHEEL_NAMES[pose.rampWheel]} on the ramp` : 'wheel on the ramp not recorded';
  const rti = roundRti(rampTravelIndex(pose.rampDistanceMm, wheelbaseMm));
  return `${formatDeg(pose.rampAngleDeg)} ramp, ${on}, ${formatLength(pose.rampDistanceMm, unit)} up it (RTI ${rti} at ${formatDeg(pose.rampAngleDeg)}); ${wheels}`;
}

/** One pose's context above its readings: wheels or ramp, the tester's notes, the photos (thumbnail, then full size). */
export function PoseContext({ pose, photos, wheelbaseMm, unit }: { pose: Pose; photos: Photo[]; wheelbaseMm: number; unit: UnitSystem }) {
  const [open, setOpen] = useState<Photo | null>(null);
  const dialog = useRef<HTMLDialogElement>(null);
  const show = (photo: Photo) => {
    setOpen(photo);
    dialog.current?.showModal();
  };
  const name = pose.label || `Pose ${pose.seq}`;
  return (
    <div className="space-y-1 text-left text-sm" data-pose-context={pose.id}>
      <p>
        <b>{name}</b> · {poseWheelsText(pose, wheelbaseMm, unit)}
      </p>
      {pose.notes.trim() !== '' && (
        <p>
          <b>Tester’s notes:</b> {pose.notes}
        </p>
      )}
      {photos.length > 0 && (
        <ul className="flex flex-wrap gap-2" aria-label={`Photos of ${name}`}>
          {photos.map((p, i) => (
            <li key={p.id}>
              <button
                type="button"
                className="block rounded border border-rule"
                onClick={() => show(p)}
                aria-label={`Open photo ${i + 1} of ${name} full size${p.caption ? `: ${p.caption}` : ''}`}
              >
                <img
                  src={`/api/photos/${p.id}/thumb`}
                  alt={p.caption || `Photo ${i + 1} of ${name}`}
                  // Its own proportions reserve the space before it loads, so the table does not jump.
                  width={Math.round((THUMB_HEIGHT * p.width) / Math.max(1, p.height))}
                  height={THUMB_HEIGHT}
                  className="h-20 w-auto"
                  loading="lazy"
                />
              </button>
            </li>
          ))}
        </ul>
      )}
      {photos.length === 0 && <p className="text-slate">No photos of this pose.</p>}
      <dialog ref={dialog} className="max-h-[95vh] max-w-[95vw] rounded-lg p-2" aria-label={`Photo of ${name}, full size`} onClose={() => setOpen(null)}>
        {open && (
          <figure className="space-y-2">
            <img src={`/api/photos/${open.id}`} alt={open.caption || `Photo of ${name}`} className="max-h-[80vh] w-auto" />
            <figcaption className="text-sm">
              {open.caption || name}
              {open.capturedAt ? ` · taken ${open.capturedAt.slice(0, 16).replace('T', ' ')} UTC` : ''}
            </figcaption>
          </figure>
        )}
        <form method="dialog">
          <button type="submit" className="btn mt-2">
            Close
          </button>
        </form>
      </dialog>
    </div>
  );
}
