// The posterior draws a fit summary averages over: every stored NUTS draw, or a fixed number
// from a VI or Laplace approximation.
import type { FitResult } from '../../../shared/inference/fit-types';
import type { Rng } from '../../../shared/inference/rng';

/** Draws from an approximation (VI, MAP's Laplace): enough for two-digit sds. */
export const APPROXIMATION_DRAWS = 4000;

export function posteriorDraws(result: FitResult, rng: Rng): { draws: Float64Array; count: number } {
  // A sampler's result carries its stored draws; take all of them rather than resample.
  const stored = 'samples' in result && result.samples instanceof Float64Array ? result.samples.length / result.names.length : 0;
  const count = stored > 0 ? stored : APPROXIMATION_DRAWS;
  return { draws: result.draws(rng, count), count };
}
