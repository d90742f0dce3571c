// The target on-time probability, typed as a percentage.
import { TARGET_MAX, TARGET_MIN } from '../../shared/workspace/settings';
import { NumberField } from './number-field';

function parseTarget(text: string): number | null {
  const p = Number(text) / 100;
  return text.trim() !== '' && p >= TARGET_MIN && p <= TARGET_MAX ? Math.round(p * 1000) / 1000 : null;
}

export function TargetInput({ target, onTarget, compact = false }: { target: number; onTarget: (t: number) => void; compact?: boolean }) {
  return (
    <NumberField
      label="Target on-time chance (%)"
      value={target}
      format={(t) => String(Math.round(t * 1000) / 10)}
      parse={parseTarget}
      onValue={onTarget}
      rule={`From ${TARGET_MIN * 100} to ${TARGET_MAX * 100}.`}
      min={TARGET_MIN * 100}
      max={TARGET_MAX * 100}
      step={1}
      compact={compact}
    />
  );
}
