// Exceedance probabilities of a route posterior: P(delay > t) with a credible interval.
//
// The point value is the posterior predictive probability (mean over draws); the interval is
// the 5% and 95% quantiles of the per-draw probabilities, i.e. parameter uncertainty only.
import { quantileSorted } from '../evaluation/scores';
import type { RoutePosterior } from '../predictive';

export interface Exceedance {
  readonly minutes: number;
  /** Posterior predictive P(delay > minutes). */
  readonly p: number;
  /** 90% credible interval of that probability over parameter draws. */
  readonly interval: readonly [number, number];
}

/** P(delay > minutes) for each threshold. A NaN threshold gives NaN values. */
export function exceedance(posterior: RoutePosterior, minutes: readonly number[]): Exceedance[] {
  const perDraw = new Float64Array(posterior.drawCount);
  return minutes.map((t) => {
    let sum = 0;
    for (let s = 0; s < posterior.drawCount; s++) {
      const v = posterior.draw(s).survival(t);
      perDraw[s] = v;
      sum += v;
    }
    const sorted = perDraw.slice().sort();
    return { minutes: t, p: sum / posterior.drawCount, interval: [quantileSorted(sorted, 0.05), quantileSorted(sorted, 0.95)] };
  });
}
