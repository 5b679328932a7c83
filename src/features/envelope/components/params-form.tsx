import { envelopeParams, type EnvelopeParams } from '@shared/schemas/envelope';
import type { UnitSystem } from '@shared/schemas/common';
import { fromDisplay, toDisplay } from '@shared/units';

/** The form's text state: what the engineer typed, in the display unit and in percent. */
export interface ParamsFormState {
  designTwistDeg: string;
  method: 'prediction' | 'tolerance';
  confidencePct: string;
  coveragePct: string;
  marginPct: string;
  allowance: string;
  increment: string;
  throughOrigin: boolean;
  repeatBandDeg: string;
  sealOn: boolean;
  sealFreeHeight: string;
  sealMinPct: string;
  sealMaxPct: string;
}

// Enough digits that a value round-trips (6.35 mm = 0.25 in), without float noise.
const show = (value: number) => String(Number(value.toFixed(4)));

export function toFormState(p: EnvelopeParams, unit: UnitSystem): ParamsFormState {
  return {
    designTwistDeg: show(p.designTwistDeg),
    method: p.method,
    confidencePct: show(p.confidence * 100),
    coveragePct: show(p.coverage * 100),
    marginPct: show(p.margin * 100),
    allowance: show(toDisplay(p.allowanceMm, unit)),
    increment: show(toDisplay(p.incrementMm, unit)),
    throughOrigin: p.throughOrigin,
    repeatBandDeg: show(p.repeatBandDeg),
    sealOn: p.seal !== null,
    sealFreeHeight: show(toDisplay(p.seal?.freeHeightMm ?? 0, unit)),
    sealMinPct: show(p.seal?.minCompressionPercent ?? 25),
    sealMaxPct: show(p.seal?.maxCompressionPercent ?? 50),
  };
}

const FIELD_LABELS: Record<string, string> = {
  designTwistDeg: 'Design twist',
  confidence: 'Confidence',
  coverage: 'Coverage',
  margin: 'Margin',
  allowanceMm: 'Allowance',
  incrementMm: 'Fabrication increment',
  repeatBandDeg: 'Repeat band',
  'seal.freeHeightMm': 'Seal free height',
  'seal.minCompressionPercent': 'Least compression',
  'seal.maxCompressionPercent': 'Most compression',
};

/** The typed form as parameters in mm and fractions, or the problems that name each field. */
export function fromFormState(f: ParamsFormState, unit: UnitSystem): { params: EnvelopeParams | null; problems: string[] } {
  const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));
  const candidate = {
    designTwistDeg: num(f.designTwistDeg),
    method: f.method,
    confidence: num(f.confidencePct) / 100,
    coverage: num(f.coveragePct) / 100,
    margin: num(f.marginPct) / 100,
    allowanceMm: fromDisplay(num(f.allowance), unit),
    incrementMm: fromDisplay(num(f.increment), unit),
    throughOrigin: f.throughOrigin,
    repeatBandDeg: num(f.repeatBandDeg),
    seal: f.sealOn ? { freeHeightMm: fromDisplay(num(f.sealFreeHeight), unit), minCompressionPercent: num(f.sealMinPct), maxCompressionPercent: num(f.sealMaxPct) } : null,
  };
  const parsed = envelopeParams.safeParse(candidate);
  if (parsed.success) return { params: parsed.data, problems: [] };
  return {
    params: null,
    problems: parsed.error.issues.map((i) => {
      const path = i.path.join('.');
      return `${FIELD_LABELS[path] ?? path}: ${Number.isNaN(candidate[path as keyof typeof candidate] as number) ? 'enter a number' : i.message}`;
    }),
  };
}

interface Props {
  form: ParamsFormState;
  unit: UnitSystem;
  readOnly: boolean;
  onChange: (next: ParamsFormState) => void;
}

function NumberField({ label, value, suffix, readOnly, onChange }: { label: string; value: string; suffix: string; readOnly: boolean; onChange: (v: string) => void }) {
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
  const set = <K extends keyof ParamsFormState>(key: K) => (value: ParamsFormState[K]) => onChange({ ...form, [key]: value });
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
