// A labelled number input that keeps what the user typed, reports only valid values, and
// says what is allowed while the text is not one of them.
import { useEffect, useState } from 'preact/hooks';

export interface NumberFieldProps {
  readonly label: string;
  /** The current value, shown as `format(value)`. */
  readonly value: number;
  readonly format: (value: number) => string;
  /** The value a text stands for, or null when it is not allowed. */
  readonly parse: (text: string) => number | null;
  readonly onValue: (value: number) => void;
  readonly rule: string;
  readonly min: number;
  readonly max: number;
  readonly step: number;
  readonly compact?: boolean;
}

export function NumberField({ label, value, format, parse, onValue, rule, min, max, step, compact = false }: NumberFieldProps) {
  const shown = format(value);
  const [text, setText] = useState(shown);
  useEffect(() => setText(shown), [shown]);
  const valid = parse(text) !== null;
  return (
    <label class={compact ? 'field compact' : 'field'}>
      {label}
      <input
        type="number"
        min={min}
        max={max}
        step={step}
        value={text}
        aria-invalid={!valid}
        onInput={(e) => {
          const t = (e.currentTarget as HTMLInputElement).value;
          setText(t);
          const parsed = parse(t);
          if (parsed !== null) onValue(parsed);
        }}
      />
      {!valid && <span class="field-error">{rule}</span>}
    </label>
  );
}
