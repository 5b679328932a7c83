import type { UnitSystem } from '@shared/schemas';

export function UnitToggle({ unit, onChange }: { unit: UnitSystem; onChange: (u: UnitSystem) => void }) {
  return (
    <div role="group" aria-label="Unit" className="inline-flex rounded-lg border-2 border-slate">
      {(['mm', 'in'] as const).map((u) => (
        <button
          key={u}
          type="button"
          aria-pressed={unit === u}
          className={`min-h-touch min-w-touch px-3 font-bold ${unit === u ? 'bg-slate text-paper' : 'text-slate'}`}
          onClick={() => onChange(u)}
        >
          {u}
        </button>
      ))}
    </div>
  );
}
