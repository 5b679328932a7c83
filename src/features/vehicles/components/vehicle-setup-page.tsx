import { useEffect, useState } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import type { GaugePoint, Vehicle } from '@shared/schemas';
import { useLocalVehicle } from '@/lib/db/live';
import { changedFields, patchRecord, saveRecord, saveRecords, type ItemResult, type Patch } from '@/lib/db/records';
import { LengthInput } from '@/features/field/components/length-input';
import { UnitToggle } from '@/features/field/components/unit-toggle';
import { SaveProblems } from '@/features/field/components/save-problems';
import { useFieldUnit } from '@/features/field/hooks/use-field-unit';
import { OpeningDrawing } from './opening-drawing';

const blank = (): Vehicle => ({
  id: crypto.randomUUID(),
  version: 1,
  name: '',
  chassis: '',
  body: '',
  wheelbaseMm: 3800,
  trackFrontMm: 1900,
  trackRearMm: 1900,
  opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
  nominalGapMm: 90,
  notes: '',
});

const nextLabel = (points: GaugePoint[]) => {
  for (let i = 0; i < 64; i++) {
    const l = i < 26 ? String.fromCharCode(65 + i) : `P${i + 1}`;
    if (!points.some((p) => p.label === l)) return l;
  }
  return `P${points.length + 1}`;
};

/** Vehicle setup: dimensions, the opening outline and the gauge points placed on its drawing. */
export function VehicleSetupPage() {
  const { id } = useParams();
  const isNew = id === 'new';
  const stored = useLocalVehicle(isNew ? undefined : id);
  const navigate = useNavigate();
  const [unit, setUnit] = useFieldUnit();
  const [draft, setDraft] = useState<Vehicle | null>(isNew ? blank() : null);
  // The vehicle as the form last loaded or saved it: a save sends only what was changed since.
  const [loaded, setLoaded] = useState<Vehicle | null>(null);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  useEffect(() => {
    if (!isNew && stored && !draft) {
      setDraft(stored.vehicle);
      setLoaded(stored.vehicle);
    }
  }, [isNew, stored, draft]);
  if (!draft) return <p role="status">{stored === null ? 'This vehicle is not on this phone.' : 'Loading…'}</p>;
  const points = stored?.gaugePoints ?? [];
  const len = (label: string, get: (v: Vehicle) => number, put: (v: Vehicle, mm: number) => Vehicle) => (
    <LengthInput label={label} unit={unit} valueMm={get(draft)} onChange={(mm) => mm != null && setDraft(put(draft, mm))} compact />
  );
  const open = (k: keyof Vehicle['opening']) => (v: Vehicle, mm: number) => ({ ...v, opening: { ...v.opening, [k]: mm } });
  const save = async () => {
    const r = loaded ? await patchRecord('vehicle', draft.id, changedFields(loaded, draft)) : await saveRecord('vehicle', draft);
    setProblems([r]);
    if (r.ok) setLoaded(draft);
    if (r.ok && isNew) navigate(`/field/vehicles/${draft.id}`, { replace: true });
  };
  const addPoint = async (point: GaugePoint) => setProblems(await saveRecords('gaugePoint', [point]));
  const editPoint = async (id: string, patch: Patch<'gaugePoint'>) => setProblems([await patchRecord('gaugePoint', id, patch)]);

  return (
    <section className="space-y-4">
      <div className="flex items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">{isNew ? 'New vehicle' : draft.name}</h1>
        <UnitToggle unit={unit} onChange={setUnit} />
      </div>
      <label className="block">
        <span className="field-label">Name</span>
        <input className="input" value={draft.name} onChange={(e) => setDraft({ ...draft, name: e.target.value })} />
      </label>
      <label className="block">
        <span className="field-label">Chassis</span>
        <input className="input" value={draft.chassis} onChange={(e) => setDraft({ ...draft, chassis: e.target.value })} />
      </label>
      <label className="block">
        <span className="field-label">Body</span>
        <input className="input" value={draft.body} onChange={(e) => setDraft({ ...draft, body: e.target.value })} />
      </label>
      <div className="grid grid-cols-2 gap-3">
        {len('Wheelbase', (v) => v.wheelbaseMm, (v, mm) => ({ ...v, wheelbaseMm: mm }))}
        {len('Nominal gap', (v) => v.nominalGapMm, (v, mm) => ({ ...v, nominalGapMm: mm }))}
        {len('Track front', (v) => v.trackFrontMm, (v, mm) => ({ ...v, trackFrontMm: mm }))}
        {len('Track rear', (v) => v.trackRearMm, (v, mm) => ({ ...v, trackRearMm: mm }))}
      </div>
      <h2 className="text-xl font-bold">Opening</h2>
      <div className="grid grid-cols-2 gap-3">
        {len('Width', (v) => v.opening.widthMm, open('widthMm'))}
        {len('Height', (v) => v.opening.heightMm, open('heightMm'))}
        {len('Corner radius', (v) => v.opening.cornerRadiusMm, open('cornerRadiusMm'))}
        {len('Centre y (+ left)', (v) => v.opening.centreYMm, open('centreYMm'))}
        {len('Bottom z (above rail)', (v) => v.opening.bottomZMm, open('bottomZMm'))}
      </div>
      <button type="button" className="btn-primary w-full" onClick={() => void save()}>
        Save vehicle
      </button>
      <SaveProblems results={problems} />
      {!isNew && (
        <>
          <h2 className="text-xl font-bold">Gauge points</h2>
          <p className="text-sm">Seen from the cab, looking rearward. Tap the drawing to add a point, or type y and z below.</p>
          <OpeningDrawing
            opening={draft.opening}
            points={points}
            onPlace={(yMm, zMm) => void addPoint({ id: crypto.randomUUID(), version: 1, vehicleId: draft.id, label: nextLabel(points), yMm, zMm })}
          />
          <ul className="space-y-2">
            {points.map((p) => (
              <li key={p.id} className="card grid grid-cols-[4rem_1fr_1fr_auto] items-end gap-2">
                <label>
                  <span className="block text-sm font-bold">Label</span>
                  <input className="input" defaultValue={p.label} onBlur={(e) => e.target.value !== p.label && void editPoint(p.id, { label: e.target.value })} />
                </label>
                <LengthInput compact label={`${p.label} y`} unit={unit} valueMm={p.yMm} onChange={(mm) => mm != null && void editPoint(p.id, { yMm: mm })} />
                <LengthInput compact label={`${p.label} z`} unit={unit} valueMm={p.zMm} onChange={(mm) => mm != null && void editPoint(p.id, { zMm: mm })} />
                <button type="button" className="btn" aria-label={`Remove point ${p.label}`} onClick={() => void editPoint(p.id, { deletedAt: new Date().toISOString() })}>
                  ✕
                </button>
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
