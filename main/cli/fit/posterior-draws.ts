// The posterior draws a fit summary averages over: every stored NUTS draw, the full Laplace
// approximation at a MAP mode, or a fixed number from a VI approximation.
import type { FitResult } from '../../../shared/inference/fit-types';
import { centredView, type NonCentredBlock } from '../../../shared/inference/centred-view';
import { laplaceDraws } from '../../../shared/inference/laplace-draws';
import type { Model } from '../../../shared/inference/model';
import type { Rng } from '../../../shared/inference/rng';

/** Draws from an approximation (VI, MAP's Laplace): enough for two-digit sds. */
export const APPROXIMATION_DRAWS = 4000;

export interface PosteriorDraws {
  readonly draws: Float64Array;
  readonly count: number;
  /** Where the draws came from, for the diagnostics. */
  readonly source: string;
}

/**
 * Draws for a MAP fit from the Laplace approximation in centred coordinates for `blocks`
 * (where a hierarchy is close to Gaussian; in non-centred coordinates the curvature at the
 * mode badly misjudges the spread of e^logSigma * z), refined by Newton steps to that
 * density's own mode. Null when the Hessian is not negative definite.
 */
function centredLaplace(model: Model, mode: Float64Array, blocks: readonly NonCentredBlock[], rng: Rng): Float64Array | null {
  const view = centredView(model, blocks);
  const start = new Float64Array(model.dim);
  view.toCentred(mode, start);
  const draws = laplaceDraws(view.model, start, rng, APPROXIMATION_DRAWS, 5);
  if (!draws) return null;
  for (let s = 0; s < APPROXIMATION_DRAWS; s++) {
    const row = draws.subarray(s * model.dim, (s + 1) * model.dim);
    view.toOriginal(row, row);
  }
  return draws;
}

export function posteriorDraws(model: Model, result: FitResult, rng: Rng, centredBlocks: readonly NonCentredBlock[] = []): PosteriorDraws {
  // A sampler's result carries its stored draws; take all of them rather than resample.
  const stored = 'samples' in result && result.samples instanceof Float64Array ? result.samples.length / result.names.length : 0;
  if (stored > 0) return { draws: result.draws(rng, stored), count: stored, source: 'all kept NUTS draws' };
  if (result.method === 'map') {
    // The fit's own sds are diagonal; the full Hessian keeps the correlations of the hierarchy.
    const laplace = centredLaplace(model, result.mean, centredBlocks, rng);
    if (laplace) return { draws: laplace, count: APPROXIMATION_DRAWS, source: 'Laplace approximation (full Hessian) at the mode' };
  }
  return { draws: result.draws(rng, APPROXIMATION_DRAWS), count: APPROXIMATION_DRAWS, source: `${APPROXIMATION_DRAWS} draws from the ${result.method} approximation` };
}
