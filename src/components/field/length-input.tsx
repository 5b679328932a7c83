import { useEffect, useId, useRef, useState, type KeyboardEvent } from 'react';
import type { UnitSystem } from '@shared/schemas';
import { mm as lengthSchema } from '@shared/schemas/common';
import { parseLength, showLength, toggleSign, type LengthLimits, type LengthParse } from '@/lib/field/parse-length';
import { focusNextEntry } from '@/lib/field/entry-order';

/** The range a shared schema's number field allows, for the parser to refuse beyond it by name. */
export const limitsOf = (schema: { minValue: number | null; maxValue: number | null }): LengthLimits => ({
  minMm: schema.minValue ?? -Infinity,
  maxMm: schema.maxValue ?? Infinity,
});

/** What the shared schema lets a length be (±20 m), unless a field says narrower. */
export const READING_LIMITS = limitsOf(lengthSchema);

export interface LengthInputProps {
  label: string;
  valueMm: number | null;
  unit: UnitSystem;
  /** Called with each value to store, in mm (null: the field was emptied). */
  onChange: (mm: number | null) => void;
  allowEmpty?: boolean;
  limits?: LengthLimits;
  /** Says why a typed value looks implausible (it is then kept back until the tester confirms it). */
  doubt?: (mm: number) => string | null;
  /** The fit marks this reading as inconsistent with the others. */
  warn?: boolean;
  /** 'row': label beside the entry (a reading); 'stack': label above it. */
  layout?: 'row' | 'stack';
}

type State = { kind: 'saved' } | { kind: 'refused'; parse: Extract<LengthParse, { kind: 'refused' }> } | { kind: 'doubtful'; mm: number; reason: string };

/**
 * A big entry for a length, typed in the chosen unit and stored in millimetres as it is typed.
 * Only what the parser reads exactly is stored: text it refuses, or a value that looks implausible
 * and is not yet confirmed, stays in the field with the reason beside it, and the phone keeps the
 * value the field held before this edit (never a half-typed prefix such as the 3 of "3 5/8").
 * A ± key types the minus that a phone's decimal keypad lacks; in inches, space and / keys make
 * tape fractions typeable there too.
 */
export function LengthInput(props: LengthInputProps) {
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const limits = props.limits ?? READING_LIMITS;
  const negative = limits.minMm < 0;
  const [text, setText] = useState(() => (props.valueMm == null ? '' : showLength(props.valueMm, props.unit)));
  const [state, setState] = useState<State>({ kind: 'saved' });
  const [focused, setFocused] = useState(false);
  // The stored value when this edit began: what the phone keeps while the text is not a length.
  const editBase = useRef<number | null>(props.valueMm);
  // Values handed to onChange in this edit, oldest first: a live read of one of them but the last
  // is an echo of an earlier keystroke, not news, and must not overwrite what is in the field.
  const sent = useRef<(number | null)[]>([]);
  const confirmed = useRef<number | null>(null);
  const selectOnMouseUp = useRef(false);

  useEffect(() => {
    // Live reads may skip states: the latest of our own writes settles every earlier one.
    const echo = sent.current.lastIndexOf(props.valueMm);
    if (echo >= 0) sent.current = sent.current.slice(echo + 1);
    if (sent.current.length > 0) return;
    if (focused || state.kind !== 'saved') return;
    const current = parseLength(text, props.unit, limits);
    const shows = current.kind === 'value' ? current.mm : current.kind === 'empty' ? null : undefined;
    // Keep the tester's own writing ("3 5/8") when it already says the stored value.
    if (shows !== props.valueMm) setText(props.valueMm == null ? '' : showLength(props.valueMm, props.unit));
    // eslint-disable-next-line react-hooks/exhaustive-deps -- follows the stored value, the unit, and the end of an edit
  }, [props.valueMm, props.unit, focused]);

  const store = (mm: number | null) => {
    const last = sent.current.length ? sent.current[sent.current.length - 1] : props.valueMm;
    if (last === mm) return;
    sent.current = [...sent.current, mm];
    props.onChange(mm);
  };

  const take = (next: string) => {
    setText(next);
    const parsed = parseLength(next, props.unit, limits);
    if (parsed.kind === 'empty' && !props.allowEmpty) {
      setState({ kind: 'refused', parse: { kind: 'refused', reason: 'Type a length: this field cannot be empty.', unfinished: true } });
      store(editBase.current);
    } else if (parsed.kind === 'refused') {
      setState({ kind: 'refused', parse: parsed });
      store(editBase.current);
    } else {
      const mm = parsed.kind === 'value' ? parsed.mm : null;
      const doubt = mm == null || mm === confirmed.current ? null : (props.doubt?.(mm) ?? null);
      if (doubt && mm != null) {
        setState({ kind: 'doubtful', mm, reason: doubt });
        store(editBase.current);
      } else {
        setState({ kind: 'saved' });
        store(mm);
      }
    }
  };

  const beginEdit = () => {
    // What the phone holds now: our own latest write if its echo has not come back yet.
    if (state.kind === 'saved') editBase.current = sent.current.length ? sent.current[sent.current.length - 1] : props.valueMm;
    confirmed.current = null;
  };

  // Keys beside the field keep the focus (and the phone's keyboard) in it.
  const keepFocus = (e: { preventDefault(): void }) => e.preventDefault();
  const typeKey = (edit: (t: string) => string) => {
    if (!focused) {
      beginEdit();
      input.current?.focus();
    }
    take(edit(text));
  };

  const refusedNow = state.kind === 'refused' && !(state.parse.unfinished && focused);
  // What the phone keeps while the field's text is not saved: the value from before this edit.
  const held = editBase.current == null ? 'nothing' : `${showLength(editBase.current, props.unit)} ${props.unit}`;
  const messageId = `${id}-message`;
  const keyClass = 'btn min-h-touch min-w-touch shrink-0 px-0 text-2xl';
  const entry = (
    <div className="flex gap-2">
      {negative && (
        <button
          type="button"
          className={keyClass}
          aria-label="Change sign"
          aria-describedby={`${id}-label`}
          onMouseDown={keepFocus}
          onClick={() => typeKey(toggleSign)}
        >
          ±
        </button>
      )}
      <input
        ref={input}
        id={id}
        data-entry=""
        inputMode="decimal"
        enterKeyHint="next"
        autoComplete="off"
        autoCorrect="off"
        spellCheck={false}
        className={`input mt-0 min-w-0 flex-1 text-2xl tabular-nums ${props.warn ? 'border-signal-dark bg-signal/15' : ''} ${refusedNow ? 'border-alert bg-alert-light' : ''} ${state.kind === 'doubtful' ? 'border-signal-dark bg-signal/25' : ''}`}
        value={text}
        aria-invalid={refusedNow || state.kind === 'doubtful'}
        aria-describedby={state.kind === 'saved' ? undefined : messageId}
        onFocus={(e) => {
          setFocused(true);
          beginEdit();
          e.currentTarget.select();
          selectOnMouseUp.current = true;
        }}
        onMouseUp={(e) => {
          // A tap would otherwise drop the selection made on focus in some browsers.
          if (selectOnMouseUp.current) e.preventDefault();
          selectOnMouseUp.current = false;
        }}
        onBlur={() => {
          setFocused(false);
          selectOnMouseUp.current = false;
        }}
        onKeyDown={(e: KeyboardEvent<HTMLInputElement>) => {
          if (e.key !== 'Enter') return;
          e.preventDefault();
          focusNextEntry(e.currentTarget);
        }}
        onChange={(e) => take(e.target.value)}
      />
    </div>
  );

  return (
    <div className={props.layout === 'row' ? 'grid grid-cols-[minmax(0,1fr)_minmax(0,11rem)] items-center gap-x-2' : ''}>
      <label id={`${id}-label`} htmlFor={id} className={props.layout === 'row' ? 'text-base font-bold' : 'mb-1 block text-sm font-bold'}>
        {props.label} <span className="font-normal">({props.unit})</span>
      </label>
      {entry}
      {focused && props.unit === 'in' && (
        <div className={`mt-1 flex justify-end gap-2 ${props.layout === 'row' ? 'col-start-2' : ''}`} aria-label="Fraction keys" role="group">
          <button type="button" className="btn min-h-touch px-3" aria-label="Space" onMouseDown={keepFocus} onClick={() => typeKey((t) => `${t} `)}>
            ␣
          </button>
          <button
            type="button"
            className="btn min-h-touch px-3 text-2xl"
            aria-label="Fraction bar"
            onMouseDown={keepFocus}
            onClick={() => typeKey((t) => `${t}/`)}
          >
            /
          </button>
        </div>
      )}
      {state.kind === 'refused' && (
        <p id={messageId} role={refusedNow ? 'alert' : 'status'} className={`col-span-2 mt-1 text-sm ${refusedNow ? 'font-bold text-alert' : 'text-slate'}`}>
          {state.parse.reason} {refusedNow && `Not saved: the phone keeps ${held} here.`}
        </p>
      )}
      {state.kind === 'doubtful' && (
        <div id={messageId} role="alert" className="col-span-2 mt-1 rounded-lg bg-signal/25 p-2 text-sm">
          <p className="font-bold">
            {showLength(state.mm, props.unit)} {props.unit} looks wrong: {state.reason}
          </p>
          <p>Not saved yet: the phone keeps {held} here. Re-read it, or keep it if it is right.</p>
          <button
            type="button"
            className="btn mt-1"
            onMouseDown={keepFocus}
            onClick={() => {
              confirmed.current = state.mm;
              setState({ kind: 'saved' });
              store(state.mm);
            }}
          >
            Keep {showLength(state.mm, props.unit)} {props.unit}
          </button>
        </div>
      )}
    </div>
  );
}
