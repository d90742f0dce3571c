// What every inference algorithm needs from a model.
//
// A model is a log density over an unconstrained parameter vector (transforms and their
// log-Jacobians already included), with its gradient. Algorithms never see constrained
// parameters; models never see algorithms.

export interface Model {
  /** Number of unconstrained coordinates. */
  readonly dim: number;
  /** A name per coordinate, e.g. 'mu_pop', 'log_sigma[3]', for diagnostics and output. */
  readonly names: readonly string[];
  /**
   * Log posterior density up to an additive constant at unconstrained `theta`, including
   * log-Jacobians. Writes the gradient into `grad` (length dim). Returns a non-finite
   * value (NaN or -Infinity) where the density is undefined; callers treat that as a
   * divergence, never as a number to optimise.
   */
  logDensityGrad(theta: Float64Array, grad: Float64Array): number;
  /** Present when the model supports minibatch (stochastic) gradients. */
  readonly minibatch?: MinibatchModel;
  /** Writes a sensible starting point (e.g. from data moments) into `out`; algorithms use zeros without it. */
  initialPoint?(out: Float64Array): void;
  /**
   * A positive approximation of the diagonal of -∇² log p at θ (e.g. expected Fisher
   * information plus prior curvature). MAP uses it as the L-BFGS initial inverse Hessian and
   * VI for starting sds; hierarchical models with data-rich groups are badly scaled without it.
   */
  curvatureDiagonal?(theta: Float64Array, out: Float64Array): void;
}

export interface MinibatchModel {
  /** Number of data units (weighted triples) a batch draws from. */
  readonly units: number;
  /**
   * log prior + scale * sum of the log-likelihood over units batch[0..batchLength), with its
   * gradient into `grad`. For an unbiased estimate of the full log density use
   * scale = units / batchLength when the batch is drawn uniformly.
   */
  logDensityGradBatch(theta: Float64Array, grad: Float64Array, batch: Int32Array, batchLength: number, scale: number, elementScale?: Float64Array): number;
  /**
   * Optional per-unit weights (for weighted triples, the counts). With them an algorithm can
   * draw units in proportion to weight (i.e. draw rows) and pass `elementScale[k]` =
   * totalWeight / batchLength (each draw stands for that many rows), which replaces
   * `scale * weight` for that element and keeps the estimate unbiased.
   */
  readonly unitWeights?: Float64Array;
}

/**
 * Delays collapsed to (group, value, count) triples: integer-minute delays repeat, so
 * millions of rows become a few thousand triples with an identical likelihood.
 */
export interface WeightedData {
  readonly groupCount: number;
  readonly group: Int32Array;
  readonly value: Float64Array;
  readonly count: Float64Array;
}
