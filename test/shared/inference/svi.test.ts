import { describe, expect, it } from 'vitest';
import { buildAliasTable, fitSvi } from '../../../shared/inference/svi';
import { createRng } from '../../../shared/inference/rng';
import { FitAbortedError } from '../../../shared/inference/fit-types';
import type { Model } from '../../../shared/inference/model';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import { expectRecovered, groupedGumbelData } from './grouped-fixture';

describe('fitSvi (minibatch stochastic VI)', () => {
  it('recovers every location and scale of ten Gumbel groups from 10,000 draws within 4 standard errors', async () => {
    const perGroup = 1000;
    const model = createGroupedModel(groupedGumbelData(13, perGroup), { intervalHalfWidth: 0.5 });
    const fit = await fitSvi(model, { rng: createRng(6), batchSize: 256 });
    expect(fit.converged).toBe(true);
    expect(fit.diagnostics['sampling']).toBe('rows (alias method)');
    expectRecovered(model, fit.mean, perGroup, 4);
  });

  it('recovers the same groups when started away from the MAP', async () => {
    const perGroup = 1000;
    const model = createGroupedModel(groupedGumbelData(14, perGroup));
    const fit = await fitSvi(model, { rng: createRng(7), batchSize: 512, initFromMap: false, maxIterations: 20_000 });
    expectRecovered(model, fit.mean, perGroup, 5, false);
  });

  it('scales the minibatch so its log-likelihood estimate is unbiased (weighted rows)', () => {
    const model = createGroupedModel(groupedGumbelData(15, 200));
    const mb = model.minibatch;
    const theta = new Float64Array(model.dim);
    model.initialPoint(theta);
    const grad = new Float64Array(model.dim);
    const full = model.logDensityGrad(theta, grad);
    // The prior part is the value with every count zero: evaluate a batch with zero weights.
    const none = Int32Array.of(0);
    const prior = mb.logDensityGradBatch(theta, grad, none, 1, 0);
    const table = buildAliasTable(mb.unitWeights!);
    const rng = createRng(2);
    const B = 64;
    const batch = new Int32Array(B);
    const scale = new Float64Array(B).fill(table.total / B);
    let sum = 0;
    let sumSq = 0;
    const reps = 3000;
    for (let r = 0; r < reps; r++) {
      for (let k = 0; k < B; k++) {
        const u = rng.uniform() * table.prob.length;
        const j = Math.floor(u);
        batch[k] = u - j < table.prob[j]! ? j : table.alias[j]!;
      }
      const est = mb.logDensityGradBatch(theta, grad, batch, B, 1, scale) - prior;
      sum += est;
      sumSq += est * est;
    }
    const mean = sum / reps;
    const se = Math.sqrt((sumSq / reps - mean * mean) / reps);
    expect(Math.abs(mean - (full - prior)), `mean ${mean} vs ${full - prior}, se ${se}`).toBeLessThan(4 * se);
  });

  it('draws alias-table indices in proportion to their weights', () => {
    const w = Float64Array.of(1, 0, 3, 6);
    const t = buildAliasTable(w);
    const rng = createRng(4);
    const counts = [0, 0, 0, 0];
    const n = 50_000;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform() * 4;
      const j = Math.floor(u);
      counts[u - j < t.prob[j]! ? j : t.alias[j]!]!++;
    }
    counts.forEach((c, i) => expect(Math.abs(c / n - w[i]! / 10), `index ${i}`).toBeLessThan(0.01));
    expect(() => buildAliasTable(Float64Array.of(0, 0))).toThrow(/sum to zero/);
    expect(() => buildAliasTable(Float64Array.of(1, -1))).toThrow(/>= 0/);
  });

  it('rejects a model without minibatch support', async () => {
    const plain: Model = { dim: 1, names: ['x'], logDensityGrad: (t, g) => { g[0] = -t[0]!; return -0.5 * t[0]! ** 2; } };
    await expect(fitSvi(plain, { rng: createRng(1) })).rejects.toThrow(/minibatch/);
  });

  it('is cancelled by an AbortSignal', async () => {
    const model = createGroupedModel(groupedGumbelData(16, 100));
    const controller = new AbortController();
    let calls = 0;
    const fit = fitSvi(model, { rng: createRng(1), reductions: 1e9, maxIterations: 1e9, progressIntervalMs: 0, signal: controller.signal, onProgress: () => { if (++calls === 2) controller.abort(); } });
    await expect(fit).rejects.toThrow(FitAbortedError);
  });
});
