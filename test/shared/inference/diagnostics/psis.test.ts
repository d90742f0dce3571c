import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { checkVariationalFit, fitGeneralisedPareto, paretoKThreshold, paretoSmooth } from '../../../../shared/inference/diagnostics/psis';
import { createRng } from '../../../../shared/inference/rng';
import { correlatedGaussian } from '../nuts-targets';

interface PsisCase {
  name: string;
  logWeights: number[];
  k: number;
  smoothed: number[];
}

// Produced by test/fixtures/inference/diagnostics/make-fixtures.py with ArviZ 0.23.4 (az.psislw).
const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/inference/diagnostics/arviz-reference.json', import.meta.url), 'utf8')) as { psis: PsisCase[] };

describe('paretoSmooth against ArviZ 0.23.4 psislw', () => {
  it.each(fixture.psis)('$name: same k-hat and smoothed log weights', (c) => {
    const result = paretoSmooth(Float64Array.from(c.logWeights));
    expect(Math.abs(result.k - c.k), `k: expected ${c.k}, actual ${result.k}`).toBeLessThan(1e-9 * Math.max(1, Math.abs(c.k)));
    let worst = 0;
    c.smoothed.forEach((v, i) => (worst = Math.max(worst, Math.abs(result.logWeights[i]! - v))));
    expect(worst, 'largest absolute difference in smoothed log weights').toBeLessThan(1e-9);
  });
});

describe('fitGeneralisedPareto', () => {
  it.each([0.2, 0.5, 0.8])('recovers shape k = %s from 4000 exact GPD draws (inversion of the closed-form CDF)', (k) => {
    const rng = createRng(Math.round(k * 100));
    const sigma = 2;
    const x = new Float64Array(4000);
    for (let i = 0; i < x.length; i++) x[i] = (sigma * (Math.pow(rng.uniform(), -k) - 1)) / k;
    x.sort();
    const fit = fitGeneralisedPareto(x);
    expect(Math.abs(fit.k - k)).toBeLessThan(0.07);
    expect(Math.abs(fit.sigma / sigma - 1)).toBeLessThan(0.1);
  });

  it('returns NaN for fewer than 5 values or non-finite input', () => {
    expect(fitGeneralisedPareto(Float64Array.from([1, 2, 3])).k).toBeNaN();
    expect(fitGeneralisedPareto(Float64Array.from([1, 2, 3, 4, Infinity])).k).toBeNaN();
  });
});

describe('paretoSmooth edge cases', () => {
  it('gives NaN for NaN input, Infinity for a tied tail, and rejects fewer than 2 draws', () => {
    expect(paretoSmooth(Float64Array.from([0, NaN, 1, 2])).k).toBeNaN();
    expect(paretoSmooth(new Float64Array(100).fill(-3)).k).toBe(Infinity);
    expect(() => paretoSmooth(new Float64Array(1))).toThrow(RangeError);
  });

  it('returns self-normalised weights', () => {
    const rng = createRng(3);
    const lw = Float64Array.from({ length: 500 }, () => 2 * rng.normal());
    const { logWeights } = paretoSmooth(lw);
    const total = logWeights.reduce((s, v) => s + Math.exp(v), 0);
    expect(total).toBeCloseTo(1, 12);
  });

  it('uses the sample-size threshold min(1 - 1/log10 S, 0.7) (Vehtari et al. 2024)', () => {
    expect(paretoKThreshold(100)).toBeCloseTo(0.5, 12);
    expect(paretoKThreshold(1e6)).toBe(0.7);
  });
});

// A bivariate Gaussian approximation N(0, L L^T), L lower-triangular 2 x 2 (row-major).
function gaussian2(l: [number, number, number]) {
  const [a, b, c] = l;
  return {
    draws(rng: ReturnType<typeof createRng>, count: number) {
      const out = new Float64Array(2 * count);
      for (let s = 0; s < count; s++) {
        const z0 = rng.normal();
        const z1 = rng.normal();
        out[2 * s] = a * z0;
        out[2 * s + 1] = b * z0 + c * z1;
      }
      return out;
    },
    logApproxDensity(t: Float64Array) {
      const z0 = t[0]! / a;
      const z1 = (t[1]! - b * z0) / c;
      return -Math.log(a * c) - Math.log(2 * Math.PI) - 0.5 * (z0 * z0 + z1 * z1);
    },
  };
}

describe('checkVariationalFit (Yao et al. 2018)', () => {
  it('calls the exact full-rank Gaussian good and a mean-field fit of a rho = 0.95 posterior unreliable', () => {
    const rho = 0.95;
    const model = correlatedGaussian(rho, 1, 1);
    const exact = checkVariationalFit(model, gaussian2([1, rho, Math.sqrt(1 - rho * rho)]), createRng(1), 2000);
    expect(exact.verdict).toBe('good');
    // The mean-field optimum for a Gaussian has sd = sqrt(1 - rho^2): too narrow.
    const narrow = Math.sqrt(1 - rho * rho);
    const meanField = checkVariationalFit(model, gaussian2([narrow, 0, narrow]), createRng(1), 2000);
    expect(meanField.k).toBeGreaterThan(0.7);
    expect(meanField.verdict).toBe('unreliable');
  });

  it('rejects draws of the wrong size', () => {
    const wrong = { draws: (_r: unknown, n: number) => new Float64Array(3 * n), logApproxDensity: () => 0 };
    expect(() => checkVariationalFit(correlatedGaussian(0, 1, 1), wrong, createRng(1))).toThrow(RangeError);
  });
});
