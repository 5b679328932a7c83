import type { TestSession } from '@shared/schemas';

/** The details of a session a tester can type and change later: the same fields at the start and in the editor. */
export type SessionDetails = Pick<TestSession, 'title' | 'testedOn' | 'conditions' | 'loadState' | 'tyrePressures' | 'crew' | 'notes'>;

const textFields: { key: Exclude<keyof SessionDetails, 'testedOn' | 'notes'>; label: string; placeholder: string }[] = [
  { key: 'title', label: 'Title', placeholder: 'e.g. yard flex test before boot order' },
  { key: 'conditions', label: 'Conditions', placeholder: 'ground, weather' },
  { key: 'loadState', label: 'Load state', placeholder: 'water, fuel, gear' },
  { key: 'tyrePressures', label: 'Tyre pressures', placeholder: '' },
  { key: 'crew', label: 'Who', placeholder: 'tester, spotter' },
];

/** Date, title, conditions, load, tyre pressures, crew and notes; each change goes to `onChange` at once. */
export function SessionFields({ value, onChange }: { value: SessionDetails; onChange: (patch: Partial<SessionDetails>) => void }) {
  return (
    <>
      <label className="block">
        <span className="field-label">Date</span>
        <input type="date" className="input" required value={value.testedOn} onChange={(e) => e.target.value && onChange({ testedOn: e.target.value })} />
      </label>
      {textFields.map((f) => (
        <label key={f.key} className="block">
          <span className="field-label">{f.label}</span>
          <input className="input" value={value[f.key]} placeholder={f.placeholder} onChange={(e) => onChange({ [f.key]: e.target.value })} />
        </label>
      ))}
      <label className="block">
        <span className="field-label">Session notes</span>
        <textarea className="input min-h-20 py-2" value={value.notes} onChange={(e) => onChange({ notes: e.target.value })} />
      </label>
    </>
  );
}
