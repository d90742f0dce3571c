// NUTS on a centred view of a non-centred hierarchical model (see centred-view.ts), with its
// draws, summaries and diagnostics reported in the original model's coordinates.
import { centredView, type NonCentredBlock } from './centred-view';
import type { Model } from './model';
import { convergenceSummary, nuts, summariseSamples, type NutsOptions, type NutsResult } from './nuts';

/**
 * Samples `model` with NUTS in centred coordinates for the listed blocks and returns a result
 * indistinguishable in layout from `nuts(model, options)`. Errors as for nuts().
 */
export async function nutsCentred(model: Model, blocks: readonly NonCentredBlock[], options: NutsOptions): Promise<NutsResult> {
  const view = centredView(model, blocks);
  let init = options.init;
  if (init) {
    if (init.length !== model.dim) throw new RangeError(`init has length ${init.length}, model.dim is ${model.dim}`);
    const c = new Float64Array(model.dim);
    view.toCentred(init, c);
    init = c;
  }
  const result = await nuts(view.model, { ...options, init });
  const { samples, chains, drawsPerChain } = result;
  const dim = model.dim;
  // In place, so the result's draws() (which reads `samples`) sees original coordinates.
  for (let k = 0; k < chains * drawsPerChain; k++) {
    const row = samples.subarray(k * dim, (k + 1) * dim);
    view.toOriginal(row, row);
  }
  const summary = summariseSamples(samples, chains, drawsPerChain, dim);
  const convergence = convergenceSummary(summary.rhat, summary.essBulk, summary.essTail);
  return {
    ...result,
    names: model.names.slice(),
    ...summary,
    converged: convergence.maxRhat < 1.01 && result.diagnostics['divergences'] === 0,
    diagnostics: { ...result.diagnostics, ...convergence, parameterisation: 'centred' },
  };
}
