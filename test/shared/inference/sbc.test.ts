// Simulation-based calibration of NUTS on a small grouped delay model (Talts et al. 2018).
import { describe, expect, it } from 'vitest';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import { gumbelSample } from '../../../shared/delay/gumbel';
import { rankUniformity, sbcRank } from '../../../shared/inference/diagnostics/sbc';
import { nuts } from '../../../shared/inference/nuts';
import { createRng } from '../../../shared/inference/rng';
import { collapseWeighted } from '../../../shared/inference/weighted-data';

const GROUPS = 2;
const PER_GROUP = 10;
const REPLICATIONS = 80;
const THIN = 2;
const KEPT = 99; // ranks 0..99: 100 values, 5 bins of 20
const BINS = 5;
// Upper 0.1% point of chi-square with 4 degrees of freedom: scipy.stats.chi2.ppf(0.999, 4)
// (SciPy 1.17) = 18.467. Four quantities are tested, so a correct sampler fails with
// probability below 0.4%; 80 replications put 16 expected ranks in each bin.
const CHI_SQUARE_999_DF4 = 18.467;

describe('rankUniformity', () => {
  it('is 0 for perfectly even ranks and large for piled-up ranks', () => {
    const even = Array.from({ length: 100 }, (_, i) => i);
    expect(rankUniformity(even, 99, 10).statistic).toBe(0);
    const piled = Array.from({ length: 100 }, () => 99);
    expect(rankUniformity(piled, 99, 10).statistic).toBeCloseTo(900, 9);
    expect(() => rankUniformity([0, 1], 98, 10)).toThrow(RangeError);
    expect(() => rankUniformity([100], 99, 10)).toThrow(RangeError);
    expect(sbcRank(0.5, Float64Array.from([0.1, 0.7, 0.2]))).toBe(2);
  });
});

describe('simulation-based calibration of NUTS', () => {
  it(`gives uniform ranks (chi-square, 5 bins, below ${CHI_SQUARE_999_DF4}) for group and population parameters of a ${GROUPS}-group model`, async () => {
    const rng = createRng(4242);
    const names = ['location[0]', 'log_scale[0]', 'location_pop', 'log_scale_pop'];
    const ranks = names.map(() => [] as number[]);
    let divergent = 0;
    for (let rep = 0; rep < REPLICATIONS; rep++) {
      // Draw every parameter from the model's own priors, then data from those parameters.
      const prior = createGroupedModel(collapseWeighted([0], [0], 1)).priors;
      const locPop = prior.location.popMean + prior.location.popSd * rng.normal();
      const locSigma = Math.abs(prior.location.sigmaScale * rng.normal());
      const lsPop = prior.logScale.popMean + prior.logScale.popSd * rng.normal();
      const lsSigma = Math.abs(prior.logScale.sigmaScale * rng.normal());
      const loc = Array.from({ length: GROUPS }, () => locPop + locSigma * rng.normal());
      const logScale = Array.from({ length: GROUPS }, () => lsPop + lsSigma * rng.normal());
      const group: number[] = [];
      const value: number[] = [];
      for (let g = 0; g < GROUPS; g++) {
        for (let i = 0; i < PER_GROUP; i++) {
          group.push(g);
          value.push(gumbelSample(rng, loc[g]!, Math.exp(logScale[g]!)));
        }
      }
      const model = createGroupedModel(collapseWeighted(group, value, GROUPS));
      const fit = await nuts(model, { rng: rng.split(), chains: 1, warmup: 150, draws: KEPT * THIN, targetAccept: 0.9, maxTreeDepth: 8, maxDivergentFraction: 1 });
      divergent += fit.diagnostics['divergences'] as number;
      const { layout } = model;
      const column = names.map(() => new Float64Array(KEPT));
      const theta = new Float64Array(model.dim);
      for (let k = 0; k < KEPT; k++) {
        const s = k * THIN;
        theta.set(fit.samples.subarray(s * model.dim, (s + 1) * model.dim));
        const p = model.groupParameters(theta, 0);
        column[0]![k] = p.location;
        column[1]![k] = Math.log(p.scale);
        column[2]![k] = theta[layout.location.pop]!;
        column[3]![k] = theta[layout.logScale.pop]!;
      }
      const truth = [loc[0]!, logScale[0]!, locPop, lsPop];
      truth.forEach((t, q) => ranks[q]!.push(sbcRank(t, column[q]!)));
    }
    for (const [q, name] of names.entries()) {
      const test = rankUniformity(ranks[q]!, KEPT, BINS);
      expect(test.statistic, `${name}: bin counts ${Array.from(test.counts).join(' ')}`).toBeLessThan(CHI_SQUARE_999_DF4);
    }
    // With two groups the hierarchy scales are prior-dominated, so some prior draws give funnel
    // posteriors and a few divergent transitions; many would bias the ranks.
    expect(divergent).toBeLessThan(0.03 * REPLICATIONS * KEPT * THIN);
  });
});
