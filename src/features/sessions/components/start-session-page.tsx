import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { TestSession } from '@shared/schemas';
import { useLocalVehicles } from '@/lib/db/live';
import { saveRecord, type ItemResult } from '@/lib/db/records';
import { SaveProblems } from '@/features/field/components/save-problems';
import { SafetyChecklist } from './safety-checklist';

const today = () => new Date().toISOString().slice(0, 10);

/** Start a session: vehicle, date, conditions, load, tyres, crew; the checklist before anything else. */
export function StartSessionPage() {
  const vehicles = useLocalVehicles();
  const navigate = useNavigate();
  const [form, setForm] = useState({ vehicleId: '', title: '', testedOn: today(), conditions: '', loadState: '', tyrePressures: '', crew: '', readingMode: 'gap' as TestSession['readingMode'] });
  const [safe, setSafe] = useState(false);
  const [problems, setProblems] = useState<ItemResult[]>([]);
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [k]: e.target.value });

  const start = async () => {
    const session: TestSession = { id: crypto.randomUUID(), version: 1, ...form, notes: '', safetyAckAt: new Date().toISOString() };
    const result = await saveRecord('testSession', session);
    if (result.ok) navigate(`/field/sessions/${session.id}`, { replace: true });
    else setProblems([result]);
  };

  if (vehicles && vehicles.vehicles.length === 0) {
    return (
      <p>
        No vehicle on this phone yet. <Link to="/field/vehicles/new" className="font-bold underline">Set one up</Link> first (or sync while online).
      </p>
    );
  }
  const text = (k: keyof typeof form, label: string, placeholder = '') => (
    <label className="block">
      <span className="field-label">{label}</span>
      <input className="input" value={form[k]} placeholder={placeholder} onChange={set(k)} />
    </label>
  );
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
        <select id="session-vehicle" className="input" required value={form.vehicleId} onChange={set('vehicleId')}>
          <option value="">Choose…</option>
          {vehicles?.vehicles.map((v) => (
            <option key={v.id} value={v.id}>
              {v.name}
            </option>
          ))}
        </select>
      </div>
      <label className="block">
        <span className="field-label">Date</span>
        <input type="date" className="input" required value={form.testedOn} onChange={set('testedOn')} />
      </label>
      {text('title', 'Title', 'e.g. yard flex test before boot order')}
      {text('conditions', 'Conditions', 'ground, weather')}
      {text('loadState', 'Load state', 'water, fuel, gear')}
      {text('tyrePressures', 'Tyre pressures')}
      {text('crew', 'Who', 'tester, spotter')}
      <fieldset>
        <legend className="field-label">Readings are entered as</legend>
        {(['gap', 'displacement'] as const).map((m) => (
          <label key={m} className="mr-4 inline-flex min-h-touch items-center gap-2">
            <input type="radio" name="readingMode" className="h-6 w-6" checked={form.readingMode === m} onChange={() => setForm({ ...form, readingMode: m })} />
            {m === 'gap' ? 'raw gaps (baseline subtracted)' : 'displacements'}
          </label>
        ))}
      </fieldset>
      <SafetyChecklist onAllTicked={setSafe} />
      <SaveProblems results={problems} />
      <button type="submit" className="btn-primary w-full" disabled={!safe || !form.vehicleId}>
        {safe ? 'Start session' : 'Tick every safety item to start'}
      </button>
    </form>
  );
}
