// Posterior predictive draws and checks: replicated data sets simulated under posterior draws,
// and the posterior predictive p-value of a test statistic (Gelman, Meng & Stern,
// "Posterior predictive assessment of model fitness via realized discrepancies",
// Statistica Sinica 6, 1996; Gelman et al., Bayesian Data Analysis, 3rd ed., ch. 6).
import type { Rng } from '../rng';

/** Writes one replicated data set (length out.length) simulated under parameters theta. */
export type Simulator = (theta: Float64Array, rng: Rng, out: Float64Array) => void;

/**
 * `replicates` data sets of `outLength` values, each under a posterior draw taken in turn
 * (cycling) from `draws` (count x dim, row-major). Returns replicates x outLength, row-major.
 * Throws RangeError when draws is not a whole number of rows or is empty.
 */
export function posteriorPredictiveDraws(draws: Float64Array, dim: number, simulate: Simulator, outLength: number, replicates: number, rng: Rng): Float64Array {
  if (!Number.isInteger(dim) || dim < 1 || draws.length === 0 || draws.length % dim !== 0) throw new RangeError(`draws (length ${draws.length}) must hold whole rows of dimension ${dim}`);
  if (!Number.isInteger(replicates) || replicates < 1) throw new RangeError(`replicates must be a whole number >= 1, got ${replicates}`);
  const count = draws.length / dim;
  const out = new Float64Array(replicates * outLength);
  for (let r = 0; r < replicates; r++) {
    const s = r % count;
    simulate(draws.subarray(s * dim, (s + 1) * dim), rng, out.subarray(r * outLength, (r + 1) * outLength));
  }
  return out;
}

/**
 * P(T(y_rep) >= T(y)) over replicated statistics, ties counted half. Values near 0 or 1 say
 * the model does not reproduce this feature of the data. NaN when any input is NaN or there
 * are no replicates.
 */
export function posteriorPredictivePValue(observed: number, replicated: ArrayLike<number>): number {
  if (Number.isNaN(observed) || replicated.length === 0) return NaN;
  let above = 0;
  for (let i = 0; i < replicated.length; i++) {
    const t = replicated[i]!;
    if (Number.isNaN(t)) return NaN;
    if (t > observed) above++;
    else if (t === observed) above += 0.5;
  }
  return above / replicated.length;
}
