import { describe, expect, it } from 'vitest';
import { createGroupedModel, groupPredictive } from '../../../../shared/delay/models/grouped';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import { fitAdvi } from '../../../../shared/inference/advi';
import { posteriorPredictiveDraws, posteriorPredictivePValue } from '../../../../shared/inference/diagnostics/posterior-predictive';
import { createRng } from '../../../../shared/inference/rng';
import { groupedSimulator } from '../../../../shared/inference/simulation/grouped-delays';
import { collapseWeighted } from '../../../../shared/inference/weighted-data';

function quantileOf(values: Float64Array, p: number): number {
  const sorted = Float64Array.from(values).sort();
  return sorted[Math.floor(p * (sorted.length - 1))]!;
}

describe('posteriorPredictiveDraws', () => {
  it('gives the normal-normal predictive variance 1 + v for a new observation (conjugate closed form)', () => {
    // y_i ~ N(theta, 1), theta ~ N(0, 10^2), n = 20: the posterior is N(m, v), v = 1 / (n + 1/100).
    const n = 20;
    const ybar = 1.3;
    const v = 1 / (n + 1 / 100);
    const m = v * n * ybar;
    const rng = createRng(1);
    const draws = Float64Array.from({ length: 4000 }, () => m + Math.sqrt(v) * rng.normal());
    const reps = posteriorPredictiveDraws(draws, 1, (theta, r, out) => void (out[0] = theta[0]! + r.normal()), 1, 40000, createRng(2));
    let mean = 0;
    for (const x of reps) mean += x;
    mean /= reps.length;
    let variance = 0;
    for (const x of reps) variance += (x - mean) ** 2;
    variance /= reps.length - 1;
    expect(mean).toBeCloseTo(m, 1);
    expect(Math.abs(variance / (1 + v) - 1)).toBeLessThan(0.03);
  });

  it('rejects ragged draws', () => {
    expect(() => posteriorPredictiveDraws(new Float64Array(5), 2, () => {}, 1, 1, createRng(1))).toThrow(RangeError);
    expect(() => posteriorPredictiveDraws(new Float64Array(4), 2, () => {}, 1, 0, createRng(1))).toThrow(RangeError);
  });
});

describe('posteriorPredictivePValue', () => {
  it('counts replicated statistics at or above the observed one, ties half', () => {
    expect(posteriorPredictivePValue(2, [1, 2, 3, 4])).toBe(0.625);
    expect(posteriorPredictivePValue(NaN, [1])).toBeNaN();
    expect(posteriorPredictivePValue(1, [])).toBeNaN();
  });
});

describe('a posterior predictive tail check of the grouped Gumbel model', () => {
  async function tailPValue(disruptedShare: number): Promise<number> {
    const rng = createRng(7);
    const perGroup = [1500, 1500];
    const group: number[] = [];
    const value: number[] = [];
    perGroup.forEach((n, g) => {
      for (let i = 0; i < n; i++) {
        group.push(g);
        // A typical Gumbel delay, or with probability disruptedShare a much wider disrupted one.
        const disrupted = rng.uniform() < disruptedShare;
        value.push(Math.round(disrupted ? gumbelSample(rng, 40, 60) : gumbelSample(rng, 3 + 5 * g, 9)));
      }
    });
    const observed = Float64Array.from(value);
    const model = createGroupedModel(collapseWeighted(group, value, 2));
    const fit = await fitAdvi(model, { rng: createRng(8) });
    const simulate = groupedSimulator({ groupCount: 2, sampleGroup: (theta, g, r) => groupPredictive(model, theta, g).sample(r) }, perGroup, true);
    const total = perGroup[0]! + perGroup[1]!;
    const replicates = 200;
    const reps = posteriorPredictiveDraws(fit.draws(createRng(9), replicates), model.dim, simulate, total, replicates, createRng(10));
    const stats = Float64Array.from({ length: replicates }, (_, r) => quantileOf(reps.subarray(r * total, (r + 1) * total), 0.99));
    return posteriorPredictivePValue(quantileOf(observed, 0.99), stats);
  }

  it('passes Gumbel data and flags the too-light tail on data with a 10% disrupted component', async () => {
    const clean = await tailPValue(0);
    expect(clean).toBeGreaterThan(0.01);
    expect(clean).toBeLessThan(0.99);
    // The observed 99th percentile lies beyond almost every replicated one.
    expect(await tailPValue(0.1)).toBeLessThan(0.01);
  });
});
