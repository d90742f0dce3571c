// Synthetic grouped delay data with known Gumbel parameters, for the recovery tests.
import { gumbelSample } from '../../../shared/delay/gumbel';
import { createRng } from '../../../shared/inference/rng';
import { collapseWeighted } from '../../../shared/inference/weighted-data';
import type { WeightedData } from '../../../shared/inference/model';
import type { HierarchicalDelayModel } from '../../../shared/delay/models/hierarchical-delay';
import { expect } from 'vitest';

export interface GroupedTruth {
  readonly locations: readonly number[];
  readonly scales: readonly number[];
}

/** Ten groups: locations from -6 to 21 minutes, scales from 6 to 24 minutes (invented). */
export const TEN_GROUPS: GroupedTruth = {
  locations: [-6, -3, 0, 3, 6, 9, 12, 15, 18, 21],
  scales: [6, 8, 10, 12, 14, 16, 18, 20, 22, 24],
};

/** `perGroup` draws per group, rounded to whole minutes (as delays are), collapsed to triples. */
export function groupedGumbelData(seed: number, perGroup: number, truth: GroupedTruth = TEN_GROUPS): WeightedData {
  const rng = createRng(seed);
  const G = truth.locations.length;
  const g = new Int32Array(G * perGroup);
  const v = new Float64Array(G * perGroup);
  for (let k = 0; k < G; k++) {
    for (let i = 0; i < perGroup; i++) {
      g[k * perGroup + i] = k;
      v[k * perGroup + i] = Math.round(gumbelSample(rng, truth.locations[k]!, truth.scales[k]!));
    }
  }
  return collapseWeighted(g, v, G);
}

/**
 * Large-sample sds of the Gumbel maximum-likelihood estimates from n draws:
 * Var(mu) = 1.1087 beta^2 / n, Var(beta) = 0.6079 beta^2 / n (inverse Fisher information;
 * e.g. Johnson, Kotz & Balakrishnan, "Continuous Univariate Distributions", vol. 2, ch. 22).
 */
export function gumbelEstimateSd(beta: number, n: number): { location: number; scale: number } {
  return { location: Math.sqrt((1.1087 * beta * beta) / n), scale: Math.sqrt((0.6079 * beta * beta) / n) };
}

/** Every group's location and scale within `k` standard errors (large-sample, above) of the truth. */
export function expectRecovered(model: HierarchicalDelayModel, theta: Float64Array, perGroup: number, k = 4, checkScale = true, truth: GroupedTruth = TEN_GROUPS): void {
  for (let g = 0; g < truth.locations.length; g++) {
    const p = model.groupParameters(theta, g);
    const se = gumbelEstimateSd(truth.scales[g]!, perGroup);
    expect(Math.abs(p.location - truth.locations[g]!), `group ${g} location ${p.location}, truth ${truth.locations[g]}, se ${se.location}`).toBeLessThan(k * se.location);
    if (checkScale) expect(Math.abs(p.scale - truth.scales[g]!), `group ${g} scale ${p.scale}, truth ${truth.scales[g]}, se ${se.scale}`).toBeLessThan(k * se.scale);
  }
}
