// Minibatch stochastic variational inference (Hoffman, Blei, Wang & Paisley 2013, "Stochastic
// Variational Inference", JMLR 14): mean-field ADVI whose log-likelihood gradient is estimated
// from a random minibatch, scaled so the estimate is unbiased.
//
// With weighted triples the batch draws rows, i.e. units in proportion to their counts (Walker's
// alias method, Vose's construction), each element scaled by total / batch; without
// unit weights it draws units uniformly with scale units / batch.
import type { FitResult } from './fit-types';
import type { Model } from './model';
import type { Rng } from './rng';
import { meanFieldFamily, runVariational, type GradientSource, type VariationalOptions } from './variational';

export interface SviOptions extends VariationalOptions {
  /** Units per minibatch (default 512). */
  readonly batchSize?: number;
}

/** Walker/Vose alias table for drawing index i with probability w[i] / sum(w). */
export function buildAliasTable(weights: Float64Array): { prob: Float64Array; alias: Int32Array; total: number } {
  const n = weights.length;
  let total = 0;
  for (let i = 0; i < n; i++) {
    const w = weights[i]!;
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`weight ${i} is ${w}; weights must be finite and >= 0`);
    total += w;
  }
  if (!(total > 0)) throw new RangeError('weights sum to zero');
  const prob = new Float64Array(n);
  const alias = new Int32Array(n);
  const scaled = new Float64Array(n);
  const small: number[] = [];
  const large: number[] = [];
  for (let i = 0; i < n; i++) {
    scaled[i] = (weights[i]! * n) / total;
    (scaled[i]! < 1 ? small : large).push(i);
  }
  while (small.length > 0 && large.length > 0) {
    const s = small.pop()!;
    const l = large[large.length - 1]!;
    prob[s] = scaled[s]!;
    alias[s] = l;
    scaled[l] = scaled[l]! + scaled[s]! - 1;
    if (scaled[l]! < 1) {
      large.pop();
      small.push(l);
    }
  }
  for (const i of large) prob[i] = 1;
  for (const i of small) prob[i] = 1;
  return { prob, alias, total };
}

export function fitSvi(model: Model, options: SviOptions): Promise<FitResult> {
  const mb = model.minibatch;
  if (!mb) return Promise.reject(new RangeError('this model does not support minibatch gradients (model.minibatch is missing)'));
  const batchSize = Math.max(1, Math.floor(options.batchSize ?? 512));
  const batch = new Int32Array(batchSize);
  const weights = mb.unitWeights;
  let gradient: GradientSource;
  if (weights) {
    const table = buildAliasTable(weights);
    const elementScale = new Float64Array(batchSize);
    const rowScale = table.total / batchSize;
    const n = weights.length;
    gradient = (theta, grad, rng, reuseBatch) => {
      if (!reuseBatch) drawRows(rng);
      return mb.logDensityGradBatch(theta, grad, batch, batchSize, 1, elementScale);
    };
    const drawRows = (rng: Rng): void => {
      for (let k = 0; k < batchSize; k++) {
        const u = rng.uniform() * n;
        const j = Math.floor(u);
        const i = u - j < table.prob[j]! ? j : table.alias[j]!;
        batch[k] = i;
        // Each drawn unit stands for one row; total / batch rows per draw keeps the sum unbiased.
        elementScale[k] = rowScale;
      }
    };
  } else {
    const n = mb.units;
    gradient = (theta, grad, rng, reuseBatch) => {
      if (!reuseBatch) for (let k = 0; k < batchSize; k++) batch[k] = rng.int(n);
      return mb.logDensityGradBatch(theta, grad, batch, batchSize, n / batchSize);
    };
  }
  return runVariational(model, options, {
    method: 'svi',
    family: meanFieldFamily(model.dim),
    gradient,
    diagnostics: { batchSize, sampling: weights ? 'rows (alias method)' : 'units (uniform)' },
    defaults: { antithetic: true, window: 200, reductions: 5 },
  });
}
