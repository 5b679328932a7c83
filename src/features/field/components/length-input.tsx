import { useEffect, useId, useState } from 'react';
import type { UnitSystem } from '@shared/schemas';
import { fromDisplay, toDisplay } from '@shared/units';

/** Parses what a gloved thumb types: a comma works as the decimal mark. Empty is null; junk is NaN. */
export function parseNumber(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  return /^[-+]?(\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : Number.NaN;
}

const show = (mm: number | null, unit: UnitSystem) => (mm == null ? '' : String(Number(toDisplay(mm, unit).toFixed(unit === 'in' ? 3 : 1))));

/**
 * A big numeric entry for a length, shown in the chosen unit and handed back in millimetres.
 * Each valid value is handed back at once (saved as typed); a value that is not a number is
 * named, and the last good value stays saved.
 */
export function LengthInput(props: {
  label: string;
  valueMm: number | null;
  unit: UnitSystem;
  onChange: (mm: number | null) => void;
  allowEmpty?: boolean;
  warn?: boolean;
  compact?: boolean;
}) {
  const id = useId();
  const [text, setText] = useState(show(props.valueMm, props.unit));
  const [focused, setFocused] = useState(false);
  useEffect(() => {
    if (!focused) setText(show(props.valueMm, props.unit));
  }, [props.valueMm, props.unit, focused]);
  const parsed = parseNumber(text);
  const bad = Number.isNaN(parsed) || (parsed == null && !props.allowEmpty && text !== '');
  return (
    <div>
      <label htmlFor={id} className={props.compact ? 'block text-sm font-bold' : 'field-label'}>
        {props.label} <span className="font-normal normal-case">({props.unit})</span>
      </label>
      <input
        id={id}
        inputMode="decimal"
        autoComplete="off"
        className={`input text-2xl tabular-nums ${props.warn ? 'border-signal-dark bg-signal/15' : ''} ${bad ? 'border-alert bg-alert-light' : ''}`}
        value={text}
        aria-invalid={bad}
        onFocus={() => setFocused(true)}
        onBlur={() => setFocused(false)}
        onChange={(e) => {
          setText(e.target.value);
          const v = parseNumber(e.target.value);
          if (v === null && props.allowEmpty) props.onChange(null);
          else if (v !== null && !Number.isNaN(v)) props.onChange(fromDisplay(v, props.unit));
        }}
      />
      {bad && <p className="text-sm font-bold text-alert">Not a number: “{text}”. The last good value is kept.</p>}
    </div>
  );
}
