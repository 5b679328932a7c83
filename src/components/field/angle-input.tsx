import { useId, useRef, useState } from 'react';
import { parseAngle } from '@/lib/field/parse-length';
import { focusNextEntry } from '@/lib/field/entry-order';

/**
 * An angle in degrees (a ramp's), saved as typed when it reads as one; otherwise the reason shows
 * beside it and the phone keeps the angle from before this edit (not a half-typed one).
 * Uncontrolled after the first render: what the tester types is never replaced by a live read.
 */
export function AngleInput({ label, valueDeg, onChange }: { label: string; valueDeg: number | null; onChange: (deg: number) => void }) {
  const id = useId();
  const [problem, setProblem] = useState<string | null>(null);
  const before = useRef(valueDeg);
  const sent = useRef(valueDeg);
  const send = (deg: number | null) => {
    if (deg == null || deg === sent.current) return;
    sent.current = deg;
    onChange(deg);
  };
  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-sm font-bold">
        {label} <span className="font-normal">(°)</span>
      </label>
      <input
        id={id}
        data-entry=""
        className={`input mt-0 text-2xl tabular-nums ${problem ? 'border-alert bg-alert-light' : ''}`}
        inputMode="decimal"
        enterKeyHint="next"
        autoComplete="off"
        defaultValue={valueDeg ?? ''}
        aria-invalid={problem !== null}
        aria-describedby={problem ? `${id}-problem` : undefined}
        onFocus={(e) => {
          if (!problem) before.current = sent.current = valueDeg;
          e.currentTarget.select();
        }}
        onKeyDown={(e) => {
          if (e.key !== 'Enter') return;
          e.preventDefault();
          focusNextEntry(e.currentTarget);
        }}
        onChange={(e) => {
          const parsed = parseAngle(e.target.value);
          if (parsed.kind === 'value') {
            setProblem(null);
            send(parsed.deg);
          } else {
            setProblem(parsed.kind === 'empty' ? 'Type the ramp angle.' : parsed.reason);
            send(before.current);
          }
        }}
      />
      {problem && (
        <p id={`${id}-problem`} role="alert" className="mt-1 text-sm font-bold text-alert">
          {problem} Not saved: the phone keeps {before.current ?? 'no'}°.
        </p>
      )}
    </div>
  );
}
