// The posterior draws a fit summary averages over: every stored NUTS draw, or a fixed number
// from a VI or Laplace approximation.
import type { FitResult } from '../../../shared/inference/fit-types';
import type { Rng } from '../../../shared/inference/rng';

/** Draws from an approximation (VI, MAP's Laplace): enough for two-digit sds. */
export const APPROXIMATION_DRAWS = 4000;

export function posteriorDraws(result: FitResult, rng: Rng): { draws: Float64Array; count: number } {
  const stored = typeof result.diagnostics['chains'] === 'number' && typeof result.diagnostics['drawsPerChain'] === 'number';
  const count = stored ? (result.diagnostics['chains'] as number) * (result.diagnostics['drawsPerChain'] as number) : APPROXIMATION_DRAWS;
  return { draws: result.draws(rng, count), count };
}
