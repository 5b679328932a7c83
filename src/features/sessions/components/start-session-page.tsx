import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { TestSession } from '@shared/schemas';
import { newTestSession } from '@shared/records';
import { useLocalVehicles } from '@/lib/db/live';
import { saveRecord, type ItemResult } from '@/lib/db/records';
import { SaveProblems } from '@/components/field/save-problems';
import { SAFETY_ITEMS, SafetyChecklist, safetyItemsLeft } from './safety-checklist';
import { SessionFields, type SessionDetails } from './session-fields';
import { pathTo } from '@/paths';

/** Today on the phone's own calendar (toISOString would give the UTC date, a day off near midnight). */
const localToday = () => {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
};

type Draft = SessionDetails & Pick<TestSession, 'vehicleId' | 'readingMode'>;

/** Start a session: vehicle, date, conditions, load, tyres, crew; the checklist before anything else. */
export function StartSessionPage() {
  const vehicles = useLocalVehicles();
  const navigate = useNavigate();
  const [form, setForm] = useState<Draft>(() => ({
    vehicleId: '',
    title: '',
    testedOn: localToday(),
    conditions: '',
    loadState: '',
    tyrePressures: '',
    crew: '',
    notes: '',
    readingMode: 'gap',
  }));
  const [left, setLeft] = useState<number>(SAFETY_ITEMS.length);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  // Always build on the latest draft: a handler from an earlier render must not put back a field
  // (the vehicle) that a later change already set.
  const update = (patch: Partial<Draft>) => setForm((f) => ({ ...f, ...patch }));

  // Nothing is drawn until the phone knows its vehicles: a form shown before that would be swapped
  // for "no vehicle yet" and back while the first sync runs, under a tester's thumb.
  if (vehicles === undefined) return <p role="status">Loading the vehicles on this phone…</p>;
  if (vehicles.vehicles.length === 0) {
    return (
      <p>
        No vehicle on this phone yet.{' '}
        <Link to={pathTo('vehicle', { id: 'new' })} className="font-bold underline">
          Set one up
        </Link>{' '}
        first (or sync while online).
      </p>
    );
  }
  const chosenGone = form.vehicleId !== '' && !vehicles.vehicles.some((v) => v.id === form.vehicleId);
  const missing = [form.vehicleId === '' || chosenGone ? 'Choose the vehicle' : null, left > 0 ? safetyItemsLeft(left) : null].filter(
    (m): m is string => m !== null,
  );

  const start = async () => {
    if (missing.length) return;
    const session = newTestSession({ ...form, safetyAckAt: new Date().toISOString() });
    const result = await saveRecord('testSession', session);
    if (result.ok) navigate(pathTo('fieldSession', { id: session.id }), { replace: true });
    else setProblems([result]);
  };

  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        void start();
      }}
    >
      <h1 className="text-2xl font-bold">Start a session</h1>
      <div>
        <label htmlFor="session-vehicle" className="field-label">
          Vehicle
        </label>
        {/* Uncontrolled on purpose: a phone's picker shows a choice before it reports it, and a
            controlled select re-drawn in between (the first sync bringing vehicles) was put back
            to "Choose…". The select holds the choice; the draft follows its change events. */}
        <select id="session-vehicle" className="input" required defaultValue="" onChange={(e) => update({ vehicleId: e.target.value })}>
          <option value="">Choose…</option>
          {vehicles.vehicles.map((v) => (
            <option key={v.id} value={v.id}>
              {v.name}
            </option>
          ))}
        </select>
        {chosenGone && (
          <p role="alert" className="font-bold text-alert">
            The vehicle chosen is no longer on this phone: choose again.
          </p>
        )}
      </div>
      <SessionFields value={form} onChange={update} />
      <fieldset>
        <legend className="field-label">Readings are entered as</legend>
        {(['gap', 'displacement'] as const).map((m) => (
          <label key={m} className="mr-4 inline-flex min-h-touch items-center gap-2">
            <input type="radio" name="readingMode" className="h-6 w-6" checked={form.readingMode === m} onChange={() => update({ readingMode: m })} />
            {m === 'gap' ? 'raw gaps (baseline subtracted)' : 'displacements'}
          </label>
        ))}
      </fieldset>
      <SafetyChecklist onLeftChange={setLeft} />
      <SaveProblems results={problems} />
      <button type="submit" className="btn-primary w-full" disabled={missing.length > 0}>
        {missing.length ? `To start: ${missing.join(' · ')}` : 'Start session'}
      </button>
    </form>
  );
}
