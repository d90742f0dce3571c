// The algorithms behind `layline fit --method`, and the diagnostics each adds to its result
// (PSIS k-hat for the variational methods, Yao et al. 2018).
import { fitAdvi, fitFullRankAdvi } from '../../../shared/inference/advi';
import { checkVariationalFit } from '../../../shared/inference/diagnostics/psis';
import type { FitDiagnostics, FitMethod, FitOptions, FitResult } from '../../../shared/inference/fit-types';
import { fitMap } from '../../../shared/inference/map';
import type { Model } from '../../../shared/inference/model';
import type { NonCentredBlock } from '../../../shared/inference/centred-view';
import { nuts } from '../../../shared/inference/nuts';
import { nutsCentred } from '../../../shared/inference/nuts-centred';
import type { Rng } from '../../../shared/inference/rng';
import { fitSvi } from '../../../shared/inference/svi';

export const FIT_METHODS: readonly FitMethod[] = ['map', 'advi', 'fullrank', 'svi', 'nuts'];

export function isFitMethod(name: string): name is FitMethod {
  return (FIT_METHODS as readonly string[]).includes(name);
}

export interface MethodOptions extends FitOptions {
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
}

/** Runs one algorithm; NUTS samples `centredBlocks` in centred coordinates when given. */
export function runMethod(method: FitMethod, model: Model, options: MethodOptions, centredBlocks?: readonly NonCentredBlock[]): Promise<FitResult> {
  switch (method) {
    case 'map':
      return fitMap(model, options);
    case 'advi':
      return fitAdvi(model, options);
    case 'fullrank':
      return fitFullRankAdvi(model, options);
    case 'svi':
      return fitSvi(model, options);
    case 'nuts':
      return centredBlocks && centredBlocks.length > 0 ? nutsCentred(model, centredBlocks, options) : nuts(model, options);
  }
}

/** PSIS draws for the k-hat check: Yao et al. (2018) use a few thousand. */
const PSIS_DRAWS = 2000;

/**
 * The fit's own diagnostics, plus PSIS k-hat where the fit exposes its approximation density.
 */
export function methodDiagnostics(model: Model, result: FitResult, rng: Rng): FitDiagnostics {
  const density = result.logApproxDensity;
  if (!density) return result.diagnostics;
  const check = checkVariationalFit(model, { draws: (r, n) => result.draws(r, n), logApproxDensity: (t) => density.call(result, t) }, rng, PSIS_DRAWS);
  return { ...result.diagnostics, paretoK: check.k, paretoKVerdict: check.verdict };
}
