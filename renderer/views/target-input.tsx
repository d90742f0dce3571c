// The target on-time probability, typed as a percentage.
import { useEffect, useState } from 'preact/hooks';
import { TARGET_MAX, TARGET_MIN } from '../../shared/workspace/settings';

export function TargetInput({ target, onTarget, compact = false }: { target: number; onTarget: (t: number) => void; compact?: boolean }) {
  const shown = String(Math.round(target * 1000) / 10);
  const [text, setText] = useState(shown);
  useEffect(() => setText(shown), [shown]);
  const n = Number(text) / 100;
  const valid = text.trim() !== '' && n >= TARGET_MIN && n <= TARGET_MAX;
  return (
    <label class={compact ? 'field compact' : 'field'}>
      Target on-time chance (%)
      <input
        type="number"
        min={TARGET_MIN * 100}
        max={TARGET_MAX * 100}
        step={1}
        value={text}
        aria-invalid={!valid}
        onInput={(e) => {
          const t = (e.currentTarget as HTMLInputElement).value;
          setText(t);
          const p = Number(t) / 100;
          if (t.trim() !== '' && p >= TARGET_MIN && p <= TARGET_MAX) onTarget(Math.round(p * 1000) / 1000);
        }}
      />
      {!valid && <span class="field-error">From {TARGET_MIN * 100} to {TARGET_MAX * 100}.</span>}
    </label>
  );
}
