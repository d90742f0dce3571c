import { readFileSync } from 'node:fs';
import normalRef from '@stdlib/stats-base-dists-normal';
import { describe, expect, it } from 'vitest';
import {
  effectiveSampleSize,
  effectiveSampleSizeBulk,
  effectiveSampleSizeQuantile,
  effectiveSampleSizeTail,
  rankNormalise,
  splitChains,
  splitRhat,
} from '../../../../shared/inference/diagnostics/convergence';
import { normalQuantile } from '../../../../shared/inference/diagnostics/normal-quantile';
import { createRng } from '../../../../shared/inference/rng';

interface ConvergenceCase {
  name: string;
  chains: number;
  draws: number[];
  rhat: number | null;
  essBulk: number;
  essTail: number;
  essQuantile30: number;
}

// Produced by test/fixtures/inference/diagnostics/make-fixtures.py with ArviZ 0.23.4.
const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/inference/diagnostics/arviz-reference.json', import.meta.url), 'utf8')) as {
  convergence: ConvergenceCase[];
};

function expectClose(label: string, actual: number, expected: number, relTol: number): void {
  const ok = Math.abs(actual - expected) <= relTol * Math.abs(expected);
  expect(ok, `${label}: expected ${expected}, actual ${actual}, relative tolerance ${relTol}`).toBe(true);
}

describe('normalQuantile', () => {
  it('matches @stdlib/stats-base-dists-normal quantile to 1e-8 across (0, 1)', () => {
    for (const p of [1e-9, 1e-6, 0.001, 0.02, 0.02425, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.99, 1 - 1e-9]) {
      const expected = normalRef.quantile(p, 0, 1);
      expect(Math.abs(normalQuantile(p) - expected), `p=${p}`).toBeLessThan(1e-8 * Math.max(1, Math.abs(expected)));
    }
  });

  it('follows the edge-case contract', () => {
    expect(normalQuantile(NaN)).toBeNaN();
    expect(normalQuantile(-0.1)).toBeNaN();
    expect(normalQuantile(1.1)).toBeNaN();
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
  });
});

describe('rank-normalised diagnostics against ArviZ 0.23.4', () => {
  describe.each(fixture.convergence)('$name', (c) => {
    const draws = Float64Array.from(c.draws);
    it('gives the same split R-hat', () => {
      if (c.rhat === null) {
        // ArviZ refuses one chain; splitting it still gives a usable within-chain check.
        expect(Number.isFinite(splitRhat(draws, c.chains))).toBe(true);
      } else expectClose('rhat', splitRhat(draws, c.chains), c.rhat, 1e-6);
    });
    it('gives the same bulk and tail ESS', () => {
      expectClose('essBulk', effectiveSampleSizeBulk(draws, c.chains), c.essBulk, 1e-6);
      expectClose('essTail', effectiveSampleSizeTail(draws, c.chains), c.essTail, 1e-6);
      expectClose('essQuantile30', effectiveSampleSizeQuantile(draws, c.chains, 0.3), c.essQuantile30, 1e-6);
    });
  });
});

describe('effective sample size', () => {
  it('is about S (1 - phi) / (1 + phi) for an AR(1) chain (integrated autocorrelation time, Geyer 1992)', () => {
    const rng = createRng(5);
    const chains = 4;
    const n = 5000;
    const phi = 0.6;
    const x = new Float64Array(chains * n);
    for (let c = 0; c < chains; c++) {
      let v = rng.normal();
      for (let t = 0; t < n; t++) {
        v = phi * v + Math.sqrt(1 - phi * phi) * rng.normal();
        x[c * n + t] = v;
      }
    }
    const expected = (chains * n * (1 - phi)) / (1 + phi);
    expectClose('ESS', effectiveSampleSize(x, chains), expected, 0.12);
    expectClose('bulk ESS', effectiveSampleSizeBulk(x, chains), expected, 0.12);
  });

  it('flags stuck chains: R-hat well above 1.01 when one chain sits elsewhere', () => {
    const rng = createRng(9);
    const x = new Float64Array(4 * 500);
    for (let i = 0; i < x.length; i++) x[i] = rng.normal() + (i >= 1500 ? 2 : 0);
    expect(splitRhat(x, 4)).toBeGreaterThan(1.1);
  });

  it('returns NaN for constant or non-finite draws and rejects a bad layout', () => {
    expect(effectiveSampleSizeBulk(new Float64Array(40).fill(3), 4)).toBeNaN();
    expect(splitRhat(new Float64Array(40).fill(3), 4)).toBeNaN();
    const withNaN = new Float64Array(40).map((_, i) => i);
    withNaN[7] = NaN;
    expect(splitRhat(withNaN, 4)).toBeNaN();
    expect(() => splitRhat(new Float64Array(10), 3)).toThrow(RangeError);
    expect(() => splitRhat(new Float64Array(6), 2)).toThrow(/at least 4/);
  });
});

describe('splitChains and rankNormalise', () => {
  it('drops the middle draw of odd chains', () => {
    const s = splitChains(Float64Array.from([1, 2, 3, 4, 5, 10, 20, 30, 40, 50]), 2);
    expect(s.chains).toBe(4);
    expect(Array.from(s.draws)).toEqual([1, 2, 4, 5, 10, 20, 40, 50]);
  });

  it('gives tied draws their average rank', () => {
    const z = rankNormalise(Float64Array.from([5, 1, 5, 3]));
    expect(z[0]).toBe(z[2]);
    expect(z[1]!).toBeLessThan(z[3]!);
    // rank 3.5 of 4: Phi^-1((3.5 - 0.375) / 4.25)
    expect(z[0]!).toBeCloseTo(normalRef.quantile(3.125 / 4.25, 0, 1), 8);
  });
});
