// A probability shown three ways at once: the number, a word for its band, and a marker's
// position on a 0–100% track with the target ticked; colour only repeats what they say.
import { RISK_BAND_WORDS, riskBand } from '../state/trip-table';
import { percent, percentRange } from '../app/format';

export interface RiskGaugeProps {
  readonly p: number | null;
  readonly lo: number | null;
  readonly hi: number | null;
  readonly target: number;
}

export function RiskGauge({ p, lo, hi, target }: RiskGaugeProps) {
  const band = riskBand(p, target);
  return (
    <span class={`risk risk-${band}`}>
      <span class="gauge" aria-hidden="true">
        <span class="gauge-target" style={{ left: `${target * 100}%` }} />
        {lo !== null && hi !== null && <span class="gauge-interval" style={{ left: `${lo * 100}%`, width: `${Math.max(0.5, (hi - lo) * 100)}%` }} />}
        {p !== null && <span class="gauge-marker" style={{ left: `${p * 100}%` }} />}
      </span>
      <span class="risk-word">{RISK_BAND_WORDS[band]}</span>
    </span>
  );
}

export function ProbabilityText({ p, lo, hi }: { p: number | null; lo: number | null; hi: number | null }) {
  if (p === null) return <span class="muted">—</span>;
  return (
    <span class="prob">
      <strong>{percent(p)}</strong>
      {lo !== null && hi !== null && <span class="interval"> ({percentRange(lo, hi)})</span>}
    </span>
  );
}
