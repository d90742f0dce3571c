import { describe, expect, it } from 'vitest';
import { laplaceDraws } from '../../../shared/inference/laplace-draws';
import type { Model } from '../../../shared/inference/model';
import { createRng } from '../../../shared/inference/rng';
import { correlatedGaussian } from './nuts-targets';

describe('laplaceDraws', () => {
  it('reproduces the covariance of a correlated Gaussian exactly in expectation (closed form)', () => {
    const model = correlatedGaussian(0.9, 2, 5, 1, -3);
    const n = 40000;
    const draws = laplaceDraws(model, Float64Array.from([1, -3]), createRng(1), n)!;
    let m0 = 0;
    let m1 = 0;
    for (let s = 0; s < n; s++) {
      m0 += draws[2 * s]!;
      m1 += draws[2 * s + 1]!;
    }
    m0 /= n;
    m1 /= n;
    let v0 = 0;
    let v1 = 0;
    let c = 0;
    for (let s = 0; s < n; s++) {
      const a = draws[2 * s]! - m0;
      const b = draws[2 * s + 1]! - m1;
      v0 += a * a;
      v1 += b * b;
      c += a * b;
    }
    expect(m0).toBeCloseTo(1, 1);
    expect(m1).toBeCloseTo(-3, 1);
    expect(Math.sqrt(v0 / n) / 2).toBeCloseTo(1, 1);
    expect(Math.sqrt(v1 / n) / 5).toBeCloseTo(1, 1);
    expect(c / Math.sqrt(v0 * v1)).toBeCloseTo(0.9, 2);
  });

  it('walks to the mode with damped Newton steps from a start away from it', () => {
    const model = correlatedGaussian(0.5, 1, 3, 2, 4);
    const draws = laplaceDraws(model, Float64Array.from([-5, 20]), createRng(2), 20000, 3)!;
    let m0 = 0;
    let m1 = 0;
    for (let s = 0; s < 20000; s++) {
      m0 += draws[2 * s]! / 20000;
      m1 += draws[2 * s + 1]! / 20000;
    }
    expect(m0).toBeCloseTo(2, 1);
    expect(m1).toBeCloseTo(4, 1);
  });

  it('returns null where the density is not a strict maximum', () => {
    const saddle: Model = { dim: 2, names: ['x', 'y'], logDensityGrad: (t, g) => ((g[0] = -t[0]!), (g[1] = t[1]!), -0.5 * t[0]! ** 2 + 0.5 * t[1]! ** 2) };
    expect(laplaceDraws(saddle, new Float64Array(2), createRng(1), 10)).toBeNull();
  });
});
