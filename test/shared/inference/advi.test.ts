import { describe, expect, it } from 'vitest';
import { fitAdvi, fitFullRankAdvi, FULL_RANK_MAX_DIM } from '../../../shared/inference/advi';
import { createRng } from '../../../shared/inference/rng';
import { FitAbortedError, FitDivergedError, type FitProgress } from '../../../shared/inference/fit-types';
import type { Model } from '../../../shared/inference/model';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import { expectRecovered, groupedGumbelData } from './grouped-fixture';

/** Independent normals N(m_i, s_i²) as a model: mean-field ADVI's optimum is exact here. */
function normals(m: number[], s: number[]): Model {
  return {
    dim: m.length,
    names: m.map((_, i) => `x${i}`),
    logDensityGrad(t, g) {
      let lp = 0;
      for (let i = 0; i < m.length; i++) {
        const z = (t[i]! - m[i]!) / s[i]!;
        lp -= 0.5 * z * z;
        g[i] = -z / s[i]!;
      }
      return lp;
    },
  };
}

describe.each([
  ['mean-field', fitAdvi],
  ['full-rank', fitFullRankAdvi],
] as const)('%s ADVI', (_label, fit) => {
  it('recovers the means and sds of independent normals of very different scales', async () => {
    const m = [3, -200, 0.001];
    const s = [1, 50, 1e-4];
    const r = await fit(normals(m, s), { rng: createRng(4) });
    expect(r.converged).toBe(true);
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(r.mean[i]! - m[i]!), `mean ${i}`).toBeLessThan(0.1 * s[i]!);
      expect(Math.abs(r.sd[i]! / s[i]! - 1), `sd ${i}: ${r.sd[i]}`).toBeLessThan(0.1);
    }
  });

  it('recovers every location and scale of ten Gumbel groups from 10,000 draws within 4 standard errors', async () => {
    const perGroup = 1000;
    const model = createGroupedModel(groupedGumbelData(12, perGroup), { intervalHalfWidth: 0.5 });
    const r = await fit(model, { rng: createRng(3) });
    expect(r.converged).toBe(true);
    expectRecovered(model, r.mean, perGroup, 4);
  });

  it('gives the same result for the same seed', async () => {
    const model = normals([1, 2], [0.5, 3]);
    const a = await fit(model, { rng: createRng(9) });
    const b = await fit(model, { rng: createRng(9) });
    expect(Array.from(a.mean)).toEqual(Array.from(b.mean));
    expect(Array.from(a.sd)).toEqual(Array.from(b.sd));
  });

  it('reports progress and honours the iteration cap', async () => {
    const seen: FitProgress[] = [];
    const r = await fit(normals([0], [1]), { rng: createRng(1), maxIterations: 20, onProgress: (p) => seen.push(p), progressIntervalMs: 0 });
    expect(r.iterations).toBe(20);
    expect(r.converged).toBe(false);
    expect(seen.at(-1)!.fraction).toBe(1);
    expect(seen.some((p) => p.fraction > 0 && p.fraction < 1)).toBe(true);
  });

  it('is cancelled by an AbortSignal', async () => {
    const controller = new AbortController();
    let reports = 0;
    const onProgress = (): void => {
      reports++;
      if (reports === 3) controller.abort();
    };
    const p = fit(normals([0], [1]), { rng: createRng(1), maxIterations: 1e9, reductions: 1e9, progressIntervalMs: 0, onProgress, signal: controller.signal });
    await expect(p).rejects.toThrow(FitAbortedError);
    expect(reports).toBe(3);
  });

  it('fails with a FitDivergedError when every draw lands where the density is not finite', async () => {
    const bad: Model = { dim: 1, names: ['x'], logDensityGrad: (_t, g) => { g[0] = 0; return -Infinity; } };
    await expect(fit(bad, { rng: createRng(1), initFromMap: false })).rejects.toThrow(FitDivergedError);
  });

  it('draws from its approximation: draw moments match mean and sd', async () => {
    const r = await fit(normals([5, -1], [2, 0.1]), { rng: createRng(2) });
    const n = 4000;
    const d = r.draws(createRng(3), n);
    for (let i = 0; i < 2; i++) {
      let s = 0;
      let ss = 0;
      for (let k = 0; k < n; k++) { s += d[k * 2 + i]!; ss += d[k * 2 + i]! ** 2; }
      const mean = s / n;
      const sd = Math.sqrt(ss / n - mean * mean);
      expect(Math.abs(mean - r.mean[i]!)).toBeLessThan((5 * r.sd[i]!) / Math.sqrt(n));
      expect(Math.abs(sd / r.sd[i]! - 1)).toBeLessThan(0.06);
    }
  });
});

describe('full-rank ADVI limits', () => {
  it('refuses models above FULL_RANK_MAX_DIM with a pointer to mean-field', async () => {
    const big = normals(new Array(FULL_RANK_MAX_DIM + 1).fill(0), new Array(FULL_RANK_MAX_DIM + 1).fill(1));
    await expect(fitFullRankAdvi(big, { rng: createRng(1) })).rejects.toThrow(/use mean-field ADVI/);
  });
});
