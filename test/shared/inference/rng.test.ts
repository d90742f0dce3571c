// Statistical checks of the seeded generator: reproducibility, ranges, moments, a chi-square
// uniformity test (critical value from the chi-square distribution, 99.9% point for 99 degrees
// of freedom, 148.23, standard tables) and independence of split streams.
import { describe, expect, it } from 'vitest';
import stdlibNormal from '@stdlib/stats-base-dists-normal';
import { createRng } from '../../../shared/inference/rng';

describe('createRng', () => {
  it('gives the same stream for the same seed and different streams for different seeds', () => {
    const a = createRng(42);
    const b = createRng(42);
    const c = createRng(43);
    const xs = Array.from({ length: 5 }, () => a.uniform());
    expect(Array.from({ length: 5 }, () => b.uniform())).toEqual(xs);
    expect(Array.from({ length: 5 }, () => c.uniform())).not.toEqual(xs);
  });

  it('draws uniforms strictly inside (0, 1) that pass a chi-square test on 100 bins', () => {
    const rng = createRng(7);
    const bins = new Array<number>(100).fill(0);
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      expect(u > 0 && u < 1).toBe(true);
      bins[Math.floor(u * 100)]!++;
    }
    const expected = n / 100;
    const chi2 = bins.reduce((s, o) => s + (o - expected) ** 2 / expected, 0);
    expect(chi2).toBeLessThan(148.23);
  });

  it('draws standard normals whose moments and tail share match @stdlib/stats-base-dists-normal', () => {
    const rng = createRng(11);
    const n = 200_000;
    let s = 0;
    let ss = 0;
    let beyond2 = 0;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      s += z;
      ss += z * z;
      if (z > 2) beyond2++;
    }
    expect(Math.abs(s / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(ss / n - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
    const p = 1 - stdlibNormal.cdf(2, 0, 1);
    expect(Math.abs(beyond2 / n - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n));
  });

  it('draws integers in [0, n) covering every value, and rejects a bad n', () => {
    const rng = createRng(3);
    const seen = new Set<number>();
    for (let i = 0; i < 2000; i++) {
      const k = rng.int(7);
      expect(Number.isInteger(k) && k >= 0 && k < 7).toBe(true);
      seen.add(k);
    }
    expect(seen.size).toBe(7);
    expect(() => rng.int(0)).toThrow(RangeError);
    expect(() => rng.int(2.5)).toThrow(RangeError);
  });

  it('splits into streams that are uncorrelated with the parent', () => {
    const parent = createRng(5);
    const child = parent.split();
    const n = 50_000;
    let sxy = 0;
    for (let i = 0; i < n; i++) sxy += parent.normal() * child.normal();
    expect(Math.abs(sxy / n)).toBeLessThan(4 / Math.sqrt(n));
  });

  it('rejects a seed that is not a finite number', () => {
    expect(() => createRng(NaN)).toThrow(RangeError);
    expect(() => createRng(Infinity)).toThrow(RangeError);
  });
});

// The standard exponential CDF, 1 - e^{-x}, is the closed form checked against (a standard
// result). Kolmogorov-Smirnov: with n draws, sup |F_n - F| exceeds 1.95 / sqrt(n) with
// probability about 0.001 under the true F (Smirnov's asymptotic distribution).
describe('exponential (ziggurat)', () => {
  it('draws positive values from the standard exponential (KS), with mean and variance 1', () => {
    const rng = createRng(19);
    const n = 100_000;
    const xs = new Float64Array(n);
    let sum = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      const x = rng.exponential();
      expect(x > 0 && Number.isFinite(x)).toBe(true);
      xs[i] = x;
      sum += x;
      sumSq += x * x;
    }
    xs.sort();
    let d = 0;
    xs.forEach((x, i) => {
      const F = -Math.expm1(-x);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    });
    expect(d).toBeLessThan(1.95 / Math.sqrt(n));
    const mean = sum / n;
    // Standard errors 1 / sqrt(n) for the mean and sqrt(8 / n) for the variance (fourth moment 24).
    expect(Math.abs(mean - 1)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(sumSq / n - mean * mean - 1)).toBeLessThan(4 * Math.sqrt(8 / n));
  });

  it('reaches the tail beyond the base layer at its rate', () => {
    // P(E > 8) = e^{-8}, past the ziggurat's base layer edge (7.6971), drawn by its tail rule.
    const rng = createRng(23);
    const n = 2_000_000;
    let beyond = 0;
    for (let i = 0; i < n; i++) if (rng.exponential() > 8) beyond++;
    const p = Math.exp(-8);
    expect(Math.abs(beyond / n - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n));
  });

  it('is reproducible from the seed', () => {
    const a = createRng(5);
    const b = createRng(5);
    expect(Array.from({ length: 20 }, () => a.exponential())).toEqual(Array.from({ length: 20 }, () => b.exponential()));
  });
});

describe('bulk draws', () => {
  // Enough draws that the ziggurat's slow paths (wedges and the tail beyond the base layer,
  // about 1 draw in 100) come up many times, so their hand-over of the state is exercised.
  const n = 50_000;

  it('uniformExponentialPairs gives the values and leaves the stream where uniform() then exponential() would', () => {
    const calls = createRng(99);
    const bulk = createRng(99);
    const us = new Float64Array(n);
    const es = new Float64Array(n);
    bulk.uniformExponentialPairs(us, es, n);
    for (let k = 0; k < n; k++) {
      expect(us[k]).toBe(calls.uniform());
      expect(es[k]).toBe(calls.exponential());
    }
    expect(bulk.uniform()).toBe(calls.uniform());
  });

  it('exponentials gives the values and leaves the stream where exponential() calls would', () => {
    const calls = createRng(4);
    const bulk = createRng(4);
    const es = new Float64Array(n + 1).fill(-1);
    bulk.exponentials(es, n);
    for (let k = 0; k < n; k++) expect(es[k]).toBe(calls.exponential());
    // Nothing written past count, and the streams agree afterwards.
    expect(es[n]).toBe(-1);
    expect(bulk.exponential()).toBe(calls.exponential());
  });

  it('draws nothing for a count of 0', () => {
    const a = createRng(8);
    const b = createRng(8);
    a.exponentials(new Float64Array(0), 0);
    a.uniformExponentialPairs(new Float64Array(0), new Float64Array(0), 0);
    expect(a.uniform()).toBe(b.uniform());
  });
});
