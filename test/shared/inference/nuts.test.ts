import normalRef from '@stdlib/stats-base-dists-normal';
import { describe, expect, it } from 'vitest';
import { FitAbortedError, FitDivergedError, type FitProgress } from '../../../shared/inference/fit-types';
import type { Model } from '../../../shared/inference/model';
import { nuts, warmupWindowEnds } from '../../../shared/inference/nuts';
import { createRng } from '../../../shared/inference/rng';
import { correlatedGaussian, funnel, independentGaussian } from './nuts-targets';

function checkGradient(model: Model, at: number[]): void {
  const theta = Float64Array.from(at);
  const g = new Float64Array(model.dim);
  const scratch = new Float64Array(model.dim);
  model.logDensityGrad(theta, g);
  for (let i = 0; i < model.dim; i++) {
    const h = 1e-5;
    const plus = Float64Array.from(theta);
    const minus = Float64Array.from(theta);
    plus[i] = plus[i]! + h;
    minus[i] = minus[i]! - h;
    const fd = (model.logDensityGrad(plus, scratch) - model.logDensityGrad(minus, scratch)) / (2 * h);
    expect(g[i]!).toBeCloseTo(fd, 5);
  }
}

describe('the test targets', () => {
  it('have gradients that match central finite differences', () => {
    checkGradient(correlatedGaussian(0.9, 1, 10, 1, -2), [0.3, -1.7]);
    checkGradient(funnel(3), [0.4, 0.2, -0.5, 1.1]);
    checkGradient(independentGaussian(Float64Array.from([0.1, 3])), [0.05, -2]);
  });
});

describe('nuts', () => {
  it('recovers the means, sds and correlation of a correlated, badly scaled Gaussian (closed form)', async () => {
    const model = correlatedGaussian(0.9, 1, 10, 1, -2);
    const fit = await nuts(model, { rng: createRng(11) });
    expect(fit.diagnostics.divergences).toBe(0);
    expect(fit.diagnostics.maxRhat as number).toBeLessThan(1.01);
    const truth = { mean: [1, -2], sd: [1, 10] };
    for (let i = 0; i < 2; i++) {
      // Monte Carlo standard error from the bulk ESS; 4 of them is a generous bound.
      const mcse = truth.sd[i]! / Math.sqrt(fit.essBulk[i]!);
      expect(Math.abs(fit.mean[i]! - truth.mean[i]!), `mean ${i}`).toBeLessThan(4 * mcse);
      expect(Math.abs(fit.sd[i]! / truth.sd[i]! - 1), `sd ${i}`).toBeLessThan(0.06);
    }
    const n = fit.chains * fit.drawsPerChain;
    let cov = 0;
    for (let k = 0; k < n; k++) cov += (fit.samples[2 * k]! - fit.mean[0]!) * (fit.samples[2 * k + 1]! - fit.mean[1]!);
    expect(cov / (n - 1) / (fit.sd[0]! * fit.sd[1]!)).toBeCloseTo(0.9, 1);
    expect(fit.converged).toBe(true);
    expect(fit.iterations).toBe(4 * 2000);
  });

  it('adapts the diagonal mass matrix to scales spanning four orders of magnitude, with normal quantiles (@stdlib/stats-base-dists-normal)', async () => {
    const scales = Float64Array.from({ length: 20 }, (_, i) => Math.pow(10, -2 + (4 * i) / 19));
    const fit = await nuts(independentGaussian(scales), { rng: createRng(2), chains: 2, warmup: 600, draws: 800 });
    const n = fit.chains * fit.drawsPerChain;
    const column = new Float64Array(n);
    for (let i = 0; i < scales.length; i++) {
      for (const stats of fit.chainStats) {
        const ratio = stats.inverseMetric[i]! / (scales[i]! * scales[i]!);
        expect(ratio, `inverse metric / variance for coordinate ${i}`).toBeGreaterThan(0.6);
        expect(ratio).toBeLessThan(1.6);
      }
      for (let k = 0; k < n; k++) column[k] = fit.samples[k * scales.length + i]! / scales[i]!;
      column.sort();
      for (const p of [0.05, 0.5, 0.95]) {
        const expected = normalRef.quantile(p, 0, 1);
        const empirical = column[Math.floor(p * (n - 1))]!;
        // Standard error of a sample quantile, sqrt(p(1-p)/ESS) / pdf(q), with the tail ESS.
        const se = Math.sqrt((p * (1 - p)) / fit.essTail[i]!) / normalRef.pdf(expected, 0, 1);
        expect(Math.abs(empirical - expected), `quantile ${p} of coordinate ${i} (ESS ${fit.essTail[i]})`).toBeLessThan(4.5 * se);
      }
    }
    // Well adapted, the sampler needs few leapfrog steps: no tree anywhere near the cap.
    expect(fit.diagnostics.treeDepthSaturated).toBe(0);
  });

  it('is reproducible from its seed and differs across seeds', async () => {
    const model = correlatedGaussian(0.5, 1, 2);
    const options = { chains: 2, warmup: 100, draws: 50 };
    const a = await nuts(model, { ...options, rng: createRng(7) });
    const b = await nuts(model, { ...options, rng: createRng(7) });
    const c = await nuts(model, { ...options, rng: createRng(8) });
    expect(Array.from(a.samples)).toEqual(Array.from(b.samples));
    expect(Array.from(a.samples)).not.toEqual(Array.from(c.samples));
  });

  it("counts divergences in Neal's funnel and rejects the fit when they exceed the allowed fraction", async () => {
    const options = { chains: 2, warmup: 300, draws: 300, targetAccept: 0.6 };
    const lenient = await nuts(funnel(9), { ...options, rng: createRng(3), maxDivergentFraction: 1 });
    expect(lenient.diagnostics.divergences as number).toBeGreaterThan(0);
    await expect(nuts(funnel(9), { ...options, rng: createRng(3), maxDivergentFraction: 0 })).rejects.toThrow(FitDivergedError);
    await expect(nuts(funnel(9), { ...options, rng: createRng(3), maxDivergentFraction: 0 })).rejects.toThrow(/kept transitions diverged/);
  });

  it('rejects a start point where the density is not finite with a clear FitDivergedError', async () => {
    const model: Model = { dim: 1, names: ['x'], logDensityGrad: (_t, g) => ((g[0] = 0), NaN) };
    await expect(nuts(model, { rng: createRng(1), warmup: 10, draws: 10 })).rejects.toThrow(/not finite at the start point of chain 1/);
  });

  it('reports progress up to fraction 1 and stops with FitAbortedError when its signal aborts', async () => {
    const seen: FitProgress[] = [];
    await nuts(correlatedGaussian(0, 1, 1), { rng: createRng(1), chains: 2, warmup: 200, draws: 200, progressIntervalMs: 0, onProgress: (p) => seen.push(p) });
    expect(seen.length).toBeGreaterThan(10);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!.fraction).toBeGreaterThanOrEqual(seen[i - 1]!.fraction);
    expect(seen.at(-1)!.fraction).toBe(1);
    expect(Number.isFinite(seen.at(-1)!.objective)).toBe(true);

    const controller = new AbortController();
    const run = nuts(correlatedGaussian(0, 1, 1), {
      rng: createRng(1),
      progressIntervalMs: 0,
      signal: controller.signal,
      onProgress: (p) => {
        if (p.iteration >= 50) controller.abort();
      },
    });
    await expect(run).rejects.toThrow(FitAbortedError);
  });

  it('counts trees that hit the depth cap', async () => {
    const fit = await nuts(correlatedGaussian(0.99, 1, 1), { rng: createRng(4), chains: 1, warmup: 100, draws: 100, maxTreeDepth: 1, adaptMassMatrix: false });
    expect(fit.diagnostics.treeDepthSaturated as number).toBeGreaterThan(50);
  });

  it('validates its options', async () => {
    const model = correlatedGaussian(0, 1, 1);
    await expect(nuts(model, { rng: createRng(1), chains: 0 })).rejects.toThrow(RangeError);
    await expect(nuts(model, { rng: createRng(1), targetAccept: 1 })).rejects.toThrow(/targetAccept/);
    await expect(nuts(model, { rng: createRng(1), warmup: 500, draws: 500, maxIterations: 800 })).rejects.toThrow(/exceeds maxIterations/);
    await expect(nuts(model, { rng: createRng(1), init: new Float64Array(3) })).rejects.toThrow(/init has length/);
  });

  it('resamples its stored draws when asked for a different count', async () => {
    const fit = await nuts(correlatedGaussian(0, 1, 1), { rng: createRng(1), chains: 1, warmup: 50, draws: 40 });
    expect(fit.draws(createRng(2), 40)).toEqual(fit.samples);
    const more = fit.draws(createRng(2), 100);
    expect(more.length).toBe(200);
    const stored = new Set(Array.from(fit.samples));
    for (const v of more) expect(stored.has(v)).toBe(true);
  });
});

describe('warmupWindowEnds', () => {
  it("lays out Stan's default windows for 1000 warm-up iterations (75 + 25, 50, 100, 200, 500 + 50)", () => {
    expect(warmupWindowEnds(1000)).toEqual({ start: 75, ends: [99, 149, 249, 449, 949], stop: 950 });
  });

  it('shrinks the buffers to 15% and 10% for short warm-ups and skips adaptation below 20', () => {
    expect(warmupWindowEnds(100)).toEqual({ start: 15, ends: [89], stop: 90 });
    expect(warmupWindowEnds(10)).toEqual({ start: 10, ends: [], stop: 10 });
  });
});
