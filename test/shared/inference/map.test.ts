import { describe, expect, it } from 'vitest';
import { fitMap } from '../../../shared/inference/map';
import { createRng } from '../../../shared/inference/rng';
import { FitAbortedError, FitDivergedError, type FitProgress } from '../../../shared/inference/fit-types';
import type { Model } from '../../../shared/inference/model';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import { expectRecovered, groupedGumbelData } from './grouped-fixture';

/** The Rosenbrock function as a log density: mode at (1, 1), a curved valley (a classic optimiser test). */
function rosenbrock(): Model {
  return {
    dim: 2,
    names: ['x', 'y'],
    logDensityGrad(t, g) {
      const x = t[0]!;
      const y = t[1]!;
      g[0] = -(-2 * (1 - x) - 400 * x * (y - x * x));
      g[1] = -(200 * (y - x * x));
      return -((1 - x) ** 2 + 100 * (y - x * x) ** 2);
    },
    initialPoint(out) {
      out[0] = -1.2;
      out[1] = 1;
    },
  };
}

describe('fitMap (L-BFGS)', () => {
  it('finds the mode of the Rosenbrock valley at (1, 1)', async () => {
    const fit = await fitMap(rosenbrock(), { rng: createRng(1), tolerance: 1e-12 });
    expect(fit.converged).toBe(true);
    expect(fit.mean[0]).toBeCloseTo(1, 4);
    expect(fit.mean[1]).toBeCloseTo(1, 4);
  });

  it('recovers every location and scale of ten Gumbel groups from 10,000 draws within 4 standard errors', async () => {
    const perGroup = 1000;
    const model = createGroupedModel(groupedGumbelData(11, perGroup), { intervalHalfWidth: 0.5 });
    const fit = await fitMap(model, { rng: createRng(2) });
    expect(fit.converged).toBe(true);
    expectRecovered(model, fit.mean, perGroup, 4);
  });

  it('reports progress ending at fraction 1 with the final log density', async () => {
    const seen: FitProgress[] = [];
    const fit = await fitMap(rosenbrock(), { rng: createRng(1), onProgress: (p) => seen.push(p), progressIntervalMs: 0 });
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.at(-1)!.fraction).toBe(1);
    expect(seen.at(-1)!.objective).toBe(fit.objective);
    for (const p of seen) expect(p.fraction).toBeGreaterThanOrEqual(0);
  });

  it('stops at the iteration cap and says it did not converge', async () => {
    const fit = await fitMap(rosenbrock(), { rng: createRng(1), maxIterations: 3 });
    expect(fit.iterations).toBe(3);
    expect(fit.converged).toBe(false);
  });

  it('rejects a start where the log density is not finite with a FitDivergedError', async () => {
    const bad: Model = { dim: 1, names: ['x'], logDensityGrad: (_t, g) => { g[0] = 0; return NaN; } };
    await expect(fitMap(bad, { rng: createRng(1) })).rejects.toThrow(FitDivergedError);
    await expect(fitMap(bad, { rng: createRng(1) })).rejects.toThrow(/starting point has log density NaN/);
  });

  it('rejects a gradient that turns NaN where the density is finite', async () => {
    const bad: Model = {
      dim: 1,
      names: ['x'],
      logDensityGrad: (t, g) => {
        g[0] = t[0]! > 0.5 ? NaN : -(t[0]! - 3);
        return -0.5 * (t[0]! - 3) ** 2;
      },
    };
    await expect(fitMap(bad, { rng: createRng(1) })).rejects.toThrow(/gradient became non-finite/);
  });

  it('is cancelled by an AbortSignal with a FitAbortedError', async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(fitMap(rosenbrock(), { rng: createRng(1), signal: controller.signal })).rejects.toThrow(FitAbortedError);
  });
});
