import type { PassThroughOption, PassThroughResult } from '@shared/flex';
import type { UnitSystem } from '@shared/schemas/common';
import { DEFAULT_PASS_THROUGH_DESIGN, FASTENING_NAMES, fastening, type Fastening } from '@shared/schemas/envelope';
import { OPTION_NAMES, optionRows } from '@shared/pass-through-rows';
import { formatLength } from '@shared/format';
import { DESIGN_LENGTHS, type DesignFormState, type DesignLength } from './params-form-state';

interface Props {
  design: DesignFormState;
  unit: UnitSystem;
  readOnly: boolean;
  onChange: (next: DesignFormState) => void;
  /** The options computed for the envelope on screen; null while it cannot be computed. */
  result: PassThroughResult | null;
  /** Why there is no result (no nominal gap set), when the envelope itself computed. */
  missing: string | null;
}

const OPTIONS = ['frames', 'boot', 'both'] as const;
const d = DEFAULT_PASS_THROUGH_DESIGN;

/** The typed settings in the order the form shows them. */
const SETTINGS: [key: DesignLength | 'slackPct', label: string][] = [
  ['minClearWidth', 'Least clear width'],
  ['minClearHeight', 'Least clear height'],
  ['overlapMargin', 'Overlap margin'],
  ['slackPct', 'Boot slack'],
  ['seamAllowance', 'Seam allowance'],
  ['flangeWidth', 'Flange width'],
  ['foldDepth', 'Fold depth'],
  ['fabricTolerance', 'Fabric tolerance ±'],
  ['frameTolerance', 'Frame tolerance ±'],
];
const MM_OF = Object.fromEntries(DESIGN_LENGTHS) as Record<DesignLength, (typeof DESIGN_LENGTHS)[number][1]>;

/** A setting's common-practice starting value, said beside it. */
const startOf = (key: DesignLength | 'slackPct', unit: UnitSystem) => (key === 'slackPct' ? `${d.slackPercent} %` : formatLength(d[MM_OF[key]], unit));

/**
 * The ways to close the pass-through, side by side for this envelope: the engineer sets the least
 * clear opening and the allowances, compares, and picks one; the pick is frozen with the sign-off.
 */
export function PassThroughOptions({ design, unit, readOnly, onChange, result, missing }: Props) {
  const set =
    <K extends keyof DesignFormState>(key: K) =>
    (value: DesignFormState[K]) =>
      onChange({ ...design, [key]: value });
  return (
    <section className="card space-y-3" aria-label="Pass-through design options">
      <h3 className="text-lg font-bold">Pass-through design options</h3>
      <p className="text-sm">
        The envelope applied to this opening three ways. Starting values are common practice, not a standard: set them for this build. The option you pick is
        frozen with the sign-off and printed on the fabrication sheet.
      </p>
      <fieldset className="grid gap-3 sm:grid-cols-4" disabled={readOnly}>
        <legend className="sr-only">Clear opening and allowances</legend>
        {SETTINGS.map(([key, label]) => (
          <label key={key} className="block">
            <span className="field-label">
              {label} ({key === 'slackPct' ? '%' : unit})
            </span>
            <input className="input" inputMode="decimal" value={design[key]} readOnly={readOnly} onChange={(e) => set(key)(e.target.value)} />
            <span className="text-sm">common practice: {startOf(key, unit)}</span>
          </label>
        ))}
        <label className="block">
          <span className="field-label">Fastening</span>
          <select className="input" value={design.fastening} onChange={(e) => set('fastening')(e.target.value as Fastening)}>
            {fastening.options.map((f) => (
              <option key={f} value={f}>
                {FASTENING_NAMES[f]}
              </option>
            ))}
          </select>
        </label>
        <label className="block sm:col-span-2">
          <span className="field-label">Material</span>
          <input className="input" maxLength={200} value={design.material} readOnly={readOnly} onChange={(e) => set('material')(e.target.value)} />
        </label>
        <label className="block sm:col-span-2">
          <span className="field-label">Drain</span>
          <input className="input" maxLength={300} value={design.drain} readOnly={readOnly} onChange={(e) => set('drain')(e.target.value)} />
        </label>
        <label className="block sm:col-span-2">
          <span className="field-label">Driver sits on the</span>
          <select
            className="input"
            value={design.driverSide ?? ''}
            onChange={(e) => set('driverSide')(e.target.value === '' ? null : (e.target.value as 'left' | 'right'))}
          >
            <option value="">not set (the sheet then says left/right only)</option>
            <option value="left">left (+y): left-hand drive</option>
            <option value="right">right (−y): right-hand drive</option>
          </select>
        </label>
      </fieldset>
      {missing && <p role="status">{missing}</p>}
      {result && <OptionsTable result={result} unit={unit} chosen={design.option} onPick={readOnly ? undefined : set('option')} />}
      <p className="font-bold" role="status">
        {design.option ? `Chosen: ${OPTION_NAMES[design.option]}.` : 'No option chosen yet: pick one to print its figures on the fabrication sheet.'}
      </p>
    </section>
  );
}

/** The options side by side; with onPick, each column head is a choice. */
export function OptionsTable({
  result,
  unit,
  chosen,
  onPick,
}: {
  result: PassThroughResult;
  unit: UnitSystem;
  chosen: PassThroughOption | null;
  onPick?: (o: PassThroughOption) => void;
}) {
  const rows = optionRows(result, unit);
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Pass-through options compared, scrollable">
      <table className="min-w-full border-collapse bg-white text-left" aria-label="Pass-through options compared">
        <thead>
          <tr>
            <th scope="col" className="border border-rule p-2">
              ({unit})
            </th>
            {OPTIONS.map((o) => (
              <th key={o} scope="col" className={`border border-rule p-2 ${chosen === o ? 'bg-signal/20' : ''}`}>
                {onPick ? (
                  <label className="flex min-h-touch items-center gap-2">
                    <input type="radio" name="pass-through-option" className="h-6 w-6" value={o} checked={chosen === o} onChange={() => onPick(o)} />
                    {OPTION_NAMES[o]}
                  </label>
                ) : (
                  <>
                    {OPTION_NAMES[o]}
                    {chosen === o && <b> (chosen)</b>}
                  </>
                )}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} data-row={r.key}>
              <th scope="row" className="border border-rule p-2 font-bold">
                {r.label}
              </th>
              {OPTIONS.map((o) => (
                <td key={o} data-option={o} className={`border border-rule p-2 text-sm tabular-nums ${r.problem[o] ? 'bg-alert-light text-alert' : ''}`}>
                  {r.values[o]}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
