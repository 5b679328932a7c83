import type { UnitSystem } from '@shared/schemas/common';
import type { ParamsFormState } from './params-form-state';

interface Props {
  form: ParamsFormState;
  unit: UnitSystem;
  readOnly: boolean;
  onChange: (next: ParamsFormState) => void;
}

function NumberField({
  label,
  value,
  suffix,
  readOnly,
  onChange,
}: {
  label: string;
  value: string;
  suffix: string;
  readOnly: boolean;
  onChange: (v: string) => void;
}) {
  return (
    <label className="block">
      <span className="field-label">
        {label} ({suffix})
      </span>
      <input className="input" inputMode="decimal" value={value} readOnly={readOnly} onChange={(e) => onChange(e.target.value)} />
    </label>
  );
}

/** Design parameters of an envelope draft; lengths in the display unit. */
export function ParamsForm({ form, unit, readOnly, onChange }: Props) {
  const set =
    <K extends keyof ParamsFormState>(key: K) =>
    (value: ParamsFormState[K]) =>
      onChange({ ...form, [key]: value });
  return (
    <fieldset className="grid gap-3 sm:grid-cols-3" disabled={readOnly}>
      <legend className="sr-only">Design parameters</legend>
      <NumberField label="Design twist" suffix="°" value={form.designTwistDeg} readOnly={readOnly} onChange={set('designTwistDeg')} />
      <label className="block">
        <span className="field-label">Method</span>
        <select className="input" value={form.method} onChange={(e) => set('method')(e.target.value as ParamsFormState['method'])}>
          <option value="prediction">Prediction bound (line on twist)</option>
          <option value="tolerance">Tolerance bound (repeated runs)</option>
        </select>
      </label>
      <NumberField label="Confidence" suffix="%" value={form.confidencePct} readOnly={readOnly} onChange={set('confidencePct')} />
      {form.method === 'tolerance' ? (
        <>
          <NumberField label="Coverage" suffix="%" value={form.coveragePct} readOnly={readOnly} onChange={set('coveragePct')} />
          <NumberField label="Repeat band, runs within ±" suffix="°" value={form.repeatBandDeg} readOnly={readOnly} onChange={set('repeatBandDeg')} />
        </>
      ) : (
        <label className="flex min-h-touch items-center gap-3 self-end">
          <input type="checkbox" className="h-6 w-6" checked={form.throughOrigin} onChange={(e) => set('throughOrigin')(e.target.checked)} />
          <span className="font-bold">Line through the origin</span>
        </label>
      )}
      <NumberField label="Margin" suffix="%" value={form.marginPct} readOnly={readOnly} onChange={set('marginPct')} />
      <NumberField label="Allowance" suffix={unit} value={form.allowance} readOnly={readOnly} onChange={set('allowance')} />
      <NumberField label="Fabrication increment" suffix={unit} value={form.increment} readOnly={readOnly} onChange={set('increment')} />
      <label className="flex min-h-touch items-center gap-3 self-end sm:col-span-2">
        <input type="checkbox" className="h-6 w-6" checked={form.sealOn} onChange={(e) => set('sealOn')(e.target.checked)} />
        <span className="font-bold">Check a seal across the fore-aft gap</span>
      </label>
      {form.sealOn && (
        <>
          <NumberField label="Seal free height" suffix={unit} value={form.sealFreeHeight} readOnly={readOnly} onChange={set('sealFreeHeight')} />
          <NumberField label="Least compression" suffix="%" value={form.sealMinPct} readOnly={readOnly} onChange={set('sealMinPct')} />
          <NumberField label="Most compression" suffix="%" value={form.sealMaxPct} readOnly={readOnly} onChange={set('sealMaxPct')} />
        </>
      )}
    </fieldset>
  );
}
