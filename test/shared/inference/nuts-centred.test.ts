import { describe, expect, it } from 'vitest';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import { gumbelSample } from '../../../shared/delay/gumbel';
import { centredView, groupHierarchyBlocks, observationsPerGroup } from '../../../shared/inference/centred-view';
import type { Model } from '../../../shared/inference/model';
import { nuts } from '../../../shared/inference/nuts';
import { nutsCentred } from '../../../shared/inference/nuts-centred';
import { createRng } from '../../../shared/inference/rng';
import { collapseWeighted } from '../../../shared/inference/weighted-data';

// A normal hierarchy in non-centred form, theta = [mu, logTau, z[0..G)]:
//   mu ~ N(0, 10), tau ~ HalfNormal(5) (log scale, Jacobian included), z ~ N(0, 1),
//   ybar[g] ~ N(mu + tau z[g], 1 / n[g]) (the sufficient statistic of n unit-variance draws).
function normalHierarchy(ybar: number[], n: number[]): Model {
  const G = ybar.length;
  return {
    dim: G + 2,
    names: ['mu', 'log_tau', ...ybar.map((_, g) => `z[${g}]`)],
    logDensityGrad(t, grad) {
      const mu = t[0]!;
      const logTau = t[1]!;
      const tau = Math.exp(logTau);
      let lp = -(mu * mu) / 200 - (tau * tau) / 50 + logTau;
      grad[0] = -mu / 100;
      grad[1] = -(tau * tau) / 25 + 1;
      for (let g = 0; g < G; g++) {
        const z = t[2 + g]!;
        const r = ybar[g]! - mu - tau * z;
        lp += -0.5 * z * z - 0.5 * n[g]! * r * r;
        grad[0] = grad[0]! + n[g]! * r;
        grad[1] = grad[1]! + n[g]! * r * tau * z;
        grad[2 + g] = -z + n[g]! * r * tau;
      }
      return lp;
    },
  };
}

function finiteDifferenceCheck(model: Model, at: Float64Array, relTol: number): void {
  const g = new Float64Array(model.dim);
  const scratch = new Float64Array(model.dim);
  model.logDensityGrad(at, g);
  for (let i = 0; i < model.dim; i++) {
    const h = 1e-6 * Math.max(1, Math.abs(at[i]!));
    const plus = Float64Array.from(at);
    const minus = Float64Array.from(at);
    plus[i] = plus[i]! + h;
    minus[i] = minus[i]! - h;
    const fd = (model.logDensityGrad(plus, scratch) - model.logDensityGrad(minus, scratch)) / (2 * h);
    expect(Math.abs(g[i]! - fd), `${model.names[i]}: analytic ${g[i]}, central difference ${fd}`).toBeLessThan(relTol * Math.max(1, Math.abs(fd)));
  }
}

function groupedData(groups: number, perGroup: number, seed: number) {
  const rng = createRng(seed);
  const g: number[] = [];
  const v: number[] = [];
  for (let i = 0; i < perGroup; i++) {
    for (let k = 0; k < groups; k++) {
      g.push(k);
      v.push(Math.round(gumbelSample(rng, 5 + 4 * k, 8 + 2 * k)));
    }
  }
  return collapseWeighted(g, v, groups);
}

describe('centredView', () => {
  it('has a gradient that matches central finite differences, on a normal hierarchy and the grouped delay model', () => {
    const normal = normalHierarchy([1, 3, -2], [50, 80, 20]);
    const viewN = centredView(normal, [{ pop: 0, logSigma: 1, z: [2, 3, 4] }]);
    finiteDifferenceCheck(viewN.model, Float64Array.from([0.5, 0.7, 1.2, 2.5, -1.5]), 1e-5);
    const grouped = createGroupedModel(groupedData(4, 50, 1));
    const blocks = groupHierarchyBlocks([grouped.layout.location, grouped.layout.logScale], observationsPerGroup(grouped.data));
    expect(blocks.map((b) => b.z.length)).toEqual([4, 4]);
    const view = centredView(grouped, blocks);
    const start = new Float64Array(grouped.dim);
    view.model.initialPoint!(start);
    finiteDifferenceCheck(view.model, start, 1e-4);
  });

  it('maps coordinates both ways and keeps the density up to the Jacobian -G log sigma', () => {
    const model = normalHierarchy([1, 3, -2], [50, 80, 20]);
    const view = centredView(model, [{ pop: 0, logSigma: 1, z: [2, 3, 4] }]);
    const original = Float64Array.from([0.4, 0.3, 1, -0.5, 2]);
    const centred = new Float64Array(5);
    view.toCentred(original, centred);
    expect(centred[2]).toBeCloseTo(0.4 + Math.exp(0.3) * 1, 12);
    const back = new Float64Array(5);
    view.toOriginal(centred, back);
    for (let i = 0; i < 5; i++) expect(back[i]).toBeCloseTo(original[i]!, 12);
    const g = new Float64Array(5);
    expect(view.model.logDensityGrad(centred, g)).toBeCloseTo(model.logDensityGrad(original, g) - 3 * 0.3, 10);
  });

  it('rejects overlapping or out-of-range blocks', () => {
    const model = normalHierarchy([1, 2], [5, 5]);
    expect(() => centredView(model, [{ pop: 0, logSigma: 0, z: [2, 3] }])).toThrow(RangeError);
    expect(() => centredView(model, [{ pop: 0, logSigma: 1, z: [2, 3, 4] }])).toThrow(RangeError);
    expect(() => centredView(model, [{ pop: 0, logSigma: 1, z: [] }])).toThrow(RangeError);
  });
});

describe('nutsCentred', () => {
  it('samples the same posterior as plain NUTS, reported in the original coordinates', async () => {
    const model = normalHierarchy([1, 3, -2, 0.5], [40, 60, 30, 50]);
    const blocks = [{ pop: 0, logSigma: 1, z: [2, 3, 4, 5] }];
    const options = { chains: 2, warmup: 500, draws: 1000 };
    const direct = await nuts(model, { ...options, rng: createRng(1), targetAccept: 0.95 });
    const centred = await nutsCentred(model, blocks, { ...options, rng: createRng(2) });
    expect(centred.names).toEqual(model.names);
    expect(centred.diagnostics['parameterisation']).toBe('centred');
    // The quantities both parameterisations pin down: group means mu + tau z[g].
    const groupMean = (r: typeof direct, g: number) => {
      let s = 0;
      const n = r.chains * r.drawsPerChain;
      for (let k = 0; k < n; k++) s += r.samples[k * 6]! + Math.exp(r.samples[k * 6 + 1]!) * r.samples[k * 6 + 2 + g]!;
      return s / n;
    };
    for (let g = 0; g < 4; g++) expect(Math.abs(groupMean(direct, g) - groupMean(centred, g)), `group ${g}`).toBeLessThan(0.03);
    expect(Math.abs(centred.mean[1]! - direct.mean[1]!)).toBeLessThan(0.15);
    // Centred sampling is the efficient one here: larger steps, fewer gradients.
    expect(centred.chainStats[0]!.stepSize).toBeGreaterThan(direct.chainStats[0]!.stepSize);
    expect(centred.draws(createRng(3), 2000)).toEqual(centred.samples);
  });
});

describe('groupHierarchyBlocks', () => {
  it('centres every group when each has enough observations, and none otherwise', () => {
    const model = createGroupedModel(collapseWeighted([0, 0, 1, ...Array.from({ length: 30 }, () => 2)], [1, 2, 3, ...Array.from({ length: 30 }, (_, i) => i)], 3));
    const n = observationsPerGroup(model.data);
    expect(Array.from(n)).toEqual([2, 1, 30]);
    expect(groupHierarchyBlocks([model.layout.location, model.layout.logScale], n)).toEqual([]);
    const { location, logScale } = model.layout;
    expect(groupHierarchyBlocks([location, logScale], Float64Array.from([20, 25, 30]))).toEqual([
      { pop: location.pop, logSigma: location.logSigmaGroup, z: [location.zGroup, location.zGroup + 1, location.zGroup + 2] },
      { pop: logScale.pop, logSigma: logScale.logSigmaGroup, z: [logScale.zGroup, logScale.zGroup + 1, logScale.zGroup + 2] },
    ]);
  });
});
