// Automatic-differentiation variational inference (Kucukelbir et al. 2017): mean-field and
// full-rank Gaussian approximations in unconstrained space, on the engine in variational.ts.
import type { FitResult } from './fit-types';
import type { Model } from './model';
import { fullRankFamily, meanFieldFamily, runVariational, type VariationalOptions } from './variational';

export type AdviOptions = VariationalOptions;

/** Coordinates beyond which full-rank ADVI refuses (dim² parameters): use mean-field there. */
export const FULL_RANK_MAX_DIM = 1000;

function fullGradient(model: Model) {
  return (theta: Float64Array, grad: Float64Array) => model.logDensityGrad(theta, grad);
}

/**
 * Mean-field ADVI: independent normals per unconstrained coordinate. Fast and scalable, but it
 * under-states posterior variance where coordinates are correlated.
 * @example const fit = await fitAdvi(model, { rng: createRng(1) }); fit.mean, fit.sd
 */
export function fitAdvi(model: Model, options: AdviOptions): Promise<FitResult> {
  return runVariational(model, options, { method: 'advi', family: meanFieldFamily(model.dim), gradient: fullGradient(model) });
}

/** Full-rank ADVI: a multivariate normal with a Cholesky-factor covariance; dim <= FULL_RANK_MAX_DIM. */
export function fitFullRankAdvi(model: Model, options: AdviOptions): Promise<FitResult> {
  if (model.dim > FULL_RANK_MAX_DIM) {
    return Promise.reject(new RangeError(`full-rank ADVI needs dim <= ${FULL_RANK_MAX_DIM} (this model has ${model.dim}); use mean-field ADVI`));
  }
  // Half ADVI's first step: dense factors on curved (hierarchical) posteriors wander at 0.1.
  return runVariational(model, options, { method: 'fullrank', family: fullRankFamily(model.dim), gradient: fullGradient(model), defaults: { initialStep: 0.05 } });
}
