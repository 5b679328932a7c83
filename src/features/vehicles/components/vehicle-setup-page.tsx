import { useEffect, useState } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { gaugePoint as gaugePointSchema, opening as openingSchema, vehicle as vehicleSchema, type GaugePoint, type Vehicle } from '@shared/schemas';
import { newGaugePoint, newVehicle } from '@shared/records';
import { useLocalVehicle } from '@/lib/db/live';
import { changedFields, patchRecord, saveRecord, saveRecords, type ItemResult } from '@/lib/db/records';
import { LengthInput, limitsOf } from '@/components/field/length-input';
import type { LengthLimits } from '@/lib/field/parse-length';
import { UnitToggle } from '@/components/field/unit-toggle';
import { SaveProblems } from '@/components/field/save-problems';
import { useFieldUnit } from '@/lib/field/use-field-unit';
import { OpeningDrawing } from './opening-drawing';
import { pathTo } from '@/paths';
import { nextPointLabel } from '../next-point-label';

const v = vehicleSchema.shape;
const o = openingSchema.shape;
const POINT_LIMITS = limitsOf(gaugePointSchema.shape.yMm);

/** Vehicle setup: dimensions, the opening outline and the gauge points placed on its drawing. */
export function VehicleSetupPage() {
  const { id } = useParams();
  const isNew = id === 'new';
  const stored = useLocalVehicle(isNew ? undefined : id);
  const navigate = useNavigate();
  const [unit, setUnit] = useFieldUnit();
  const [draft, setDraft] = useState<Vehicle | null>(isNew ? newVehicle() : null);
  // The vehicle as it was when the draft was taken: a save writes only what the tester changed.
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
  const len = (label: string, limits: LengthLimits, get: (v: Vehicle) => number, put: (v: Vehicle, mm: number) => Vehicle) => (
    <LengthInput label={label} unit={unit} limits={limits} valueMm={get(draft)} onChange={(mm) => mm != null && setDraft((d) => (d ? put(d, mm) : d))} />
  );
  const open = (k: keyof Vehicle['opening']) => (v: Vehicle, mm: number) => ({ ...v, opening: { ...v.opening, [k]: mm } });
  const save = async () => {
    if (isNew) {
      const r = await saveRecord('vehicle', draft);
      setProblems([r]);
      if (r.ok) {
        setLoaded(draft);
        navigate(pathTo('vehicle', { id: draft.id }), { replace: true });
      }
      return;
    }
    const r = await patchRecord('vehicle', draft.id, changedFields(loaded ?? draft, draft));
    setProblems([r]);
    if (r.ok) setLoaded(draft);
  };
  const addPoint = async (point: GaugePoint) => setProblems(await saveRecords('gaugePoint', [point]));
  const patchPoint = async (id: string, fields: Partial<GaugePoint>) => setProblems([await patchRecord('gaugePoint', id, fields)]);

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
        {len(
          'Wheelbase',
          limitsOf(v.wheelbaseMm),
          (x) => x.wheelbaseMm,
          (x, mm) => ({ ...x, wheelbaseMm: mm }),
        )}
        {len(
          'Nominal gap',
          limitsOf(v.nominalGapMm),
          (x) => x.nominalGapMm,
          (x, mm) => ({ ...x, nominalGapMm: mm }),
        )}
        {len(
          'Track front',
          limitsOf(v.trackFrontMm),
          (x) => x.trackFrontMm,
          (x, mm) => ({ ...x, trackFrontMm: mm }),
        )}
        {len(
          'Track rear',
          limitsOf(v.trackRearMm),
          (x) => x.trackRearMm,
          (x, mm) => ({ ...x, trackRearMm: mm }),
        )}
      </div>
      <h2 className="text-xl font-bold">Opening</h2>
      <div className="grid grid-cols-2 gap-3">
        {len('Width', limitsOf(o.widthMm), (x) => x.opening.widthMm, open('widthMm'))}
        {len('Height', limitsOf(o.heightMm), (x) => x.opening.heightMm, open('heightMm'))}
        {len('Corner radius', limitsOf(o.cornerRadiusMm), (x) => x.opening.cornerRadiusMm, open('cornerRadiusMm'))}
        {len('Centre y (+ left)', limitsOf(o.centreYMm), (x) => x.opening.centreYMm, open('centreYMm'))}
        {len('Bottom z (above rail)', limitsOf(o.bottomZMm), (x) => x.opening.bottomZMm, open('bottomZMm'))}
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
            onPlace={(yMm, zMm) => void addPoint(newGaugePoint({ vehicleId: draft.id, label: nextPointLabel(points), yMm, zMm }))}
          />
          <ul className="space-y-2">
            {points.map((p) => (
              <li key={p.id} className="card space-y-2 p-3">
                <div className="flex items-end gap-2">
                  <label className="w-24">
                    <span className="block text-sm font-bold">Label</span>
                    <input
                      className="input"
                      defaultValue={p.label}
                      onBlur={(e) => e.target.value !== p.label && void patchPoint(p.id, { label: e.target.value })}
                    />
                  </label>
                  <button
                    type="button"
                    className="btn ml-auto"
                    aria-label={`Remove point ${p.label}`}
                    onClick={() => void patchPoint(p.id, { deletedAt: new Date().toISOString() })}
                  >
                    ✕
                  </button>
                </div>
                <div className="grid grid-cols-2 gap-2">
                  <LengthInput
                    label={`${p.label} y`}
                    unit={unit}
                    limits={POINT_LIMITS}
                    valueMm={p.yMm}
                    onChange={(mm) => mm != null && void patchPoint(p.id, { yMm: mm })}
                  />
                  <LengthInput
                    label={`${p.label} z`}
                    unit={unit}
                    limits={POINT_LIMITS}
                    valueMm={p.zMm}
                    onChange={(mm) => mm != null && void patchPoint(p.id, { zMm: mm })}
                  />
                </div>
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
