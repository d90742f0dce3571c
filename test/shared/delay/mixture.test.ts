// Reference: the mixture's functions are weighted sums of the components', checked here against
// @stdlib/stats-base-dists-gumbel and @stdlib/stats-base-dists-normal component values.
import { describe, expect, it } from 'vitest';
import stdlibGumbel from '@stdlib/stats-base-dists-gumbel';
import stdlibNormal from '@stdlib/stats-base-dists-normal';
import { gumbelDistribution } from '../../../shared/delay/gumbel';
import { mixtureDistribution } from '../../../shared/delay/mixture';
import { normalDistribution } from '../../../shared/delay/normal';
import { createRng } from '../../../shared/inference/rng';
import { expectClose } from './close';

describe('mixtureDistribution', () => {
  const mix = mixtureDistribution([gumbelDistribution(-4, 11), gumbelDistribution(30, 45), normalDistribution(0, 5)], [0.7, 0.2, 0.1]);

  it('is the weighted sum of its components (stdlib Gumbel and Normal as reference)', () => {
    for (const x of [-30, -5, 0, 15, 60, 120, 240]) {
      const cdf = 0.7 * stdlibGumbel.cdf(x, -4, 11) + 0.2 * stdlibGumbel.cdf(x, 30, 45) + 0.1 * stdlibNormal.cdf(x, 0, 5);
      const pdf = 0.7 * stdlibGumbel.pdf(x, -4, 11) + 0.2 * stdlibGumbel.pdf(x, 30, 45) + 0.1 * stdlibNormal.pdf(x, 0, 5);
      expectClose(mix.cdf(x), cdf, 1e-12, `cdf(${x})`);
      expectClose(mix.pdf(x), pdf, 1e-12, `pdf(${x})`);
      expectClose(mix.survival(x), 1 - cdf, 1e-9, `survival(${x})`, 1e-15);
    }
  });

  it('samples each component in proportion to its weight', () => {
    const two = mixtureDistribution([normalDistribution(-100, 1), normalDistribution(100, 1)], [0.25, 0.75]);
    const rng = createRng(3);
    let high = 0;
    const n = 40_000;
    for (let i = 0; i < n; i++) if (two.sample(rng) > 0) high++;
    expect(Math.abs(high / n - 0.75)).toBeLessThan(4 * Math.sqrt((0.75 * 0.25) / n));
  });

  // Kolmogorov-Smirnov: with n = 20,000 draws, sup |F_n - F| exceeds 1.95 / sqrt(n) with
  // probability about 0.001 under the true F (Smirnov's asymptotic distribution).
  it('samples a mixture of Gumbels from its distribution (KS against @stdlib/stats-base-dists-gumbel)', () => {
    const gumbels = mixtureDistribution([gumbelDistribution(-4, 11), gumbelDistribution(30, 45), gumbelDistribution(200, 3)], [0.7, 0.25, 0.05]);
    const rng = createRng(12);
    const n = 20_000;
    const xs = Float64Array.from({ length: n }, () => gumbels.sample(rng)).sort();
    let d = 0;
    xs.forEach((x, i) => {
      const F = 0.7 * stdlibGumbel.cdf(x, -4, 11) + 0.25 * stdlibGumbel.cdf(x, 30, 45) + 0.05 * stdlibGumbel.cdf(x, 200, 3);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    });
    expect(d).toBeLessThan(1.95 / Math.sqrt(n));
  });

  it('samples in place the values that sample() gives in turn, capped, at every stride-th place only', () => {
    // Gumbel components sample in place; the Normal one through its sample().
    const out = new Float64Array(2000).fill(-1);
    mix.sampleInto!(createRng(4), out, 1, 2, 60);
    const rng = createRng(4);
    for (let i = 0; i < out.length; i++) expect(out[i]).toBe(i % 2 === 1 ? Math.min(60, mix.sample(rng)) : -1);
    expect(out.some((v) => v === 60)).toBe(true);
  });

  it('samples a mixture of Gumbels in place with the formula written out, the values of sample() in turn', () => {
    const gumbels = mixtureDistribution([gumbelDistribution(2, 11), gumbelDistribution(30, 45), gumbelDistribution(-5, 3)], [0.7, 0.2, 0.1]);
    const out = new Float64Array(3000).fill(-1);
    gumbels.sampleInto!(createRng(9), out, 2, 3, 150);
    const rng = createRng(9);
    for (let i = 0; i < out.length; i++) expect(out[i]).toBe(i % 3 === 2 ? Math.min(150, gumbels.sample(rng)) : -1);
    expect(out.some((v) => v === 150)).toBe(true);
  });

  it('rejects empty component lists and weights that are negative, non-finite or do not sum to 1', () => {
    const g = gumbelDistribution(0, 1);
    expect(() => mixtureDistribution([], [])).toThrow(/at least one/);
    expect(() => mixtureDistribution([g], [0.5])).toThrow(/sum to 1/);
    expect(() => mixtureDistribution([g, g], [1.5, -0.5])).toThrow(/>= 0/);
    expect(() => mixtureDistribution([g, g], [NaN, 1])).toThrow(/finite/);
    expect(() => mixtureDistribution([g], [0.5, 0.5])).toThrow(/1 components but 2 weights/);
  });

  it('returns NaN for NaN input', () => {
    expect(mix.cdf(NaN)).toBeNaN();
    expect(mix.survival(NaN)).toBeNaN();
    expect(mix.pdf(NaN)).toBeNaN();
  });
});

// The distribution with one optional method hidden (an own undefined over its prototype's).
function without<T extends object>(dist: T, method: keyof T): T {
  return Object.assign(Object.create(dist) as T, { [method]: undefined });
}

describe('mixtureDistribution on a grid', () => {
  it('evaluates grids when every component does, equal to its point values (@stdlib/stats-base-dists-gumbel)', () => {
    const mix = mixtureDistribution([gumbelDistribution(2, 11), gumbelDistribution(30, 45)], [0.9, 0.1]);
    const F = new Float64Array(700);
    const f = new Float64Array(700);
    mix.cdfGrid!(-150, F, 0.5);
    mix.pdfGrid!(-150, f, 0.5);
    for (let i = 0; i < F.length; i++) {
      const x = -150 + i / 2;
      expectClose(F[i]!, 0.9 * stdlibGumbel.cdf(x, 2, 11) + 0.1 * stdlibGumbel.cdf(x, 30, 45), 1e-13, `F(${x})`, 1e-15);
      expectClose(f[i]!, 0.9 * stdlibGumbel.pdf(x, 2, 11) + 0.1 * stdlibGumbel.pdf(x, 30, 45), 1e-13, `f(${x})`, 1e-15);
    }
  });

  it('sums a component that only offers plain grids through a scratch row, to the same values', () => {
    const plain = without(gumbelDistribution(30, 45), 'addGrid');
    const mixed = mixtureDistribution([gumbelDistribution(2, 11), plain], [0.9, 0.1]);
    const F = new Float64Array(500);
    const f = new Float64Array(500);
    mixed.cdfGrid!(-100, F);
    mixed.pdfGrid!(-100, f);
    for (let i = 0; i < F.length; i++) {
      const x = -100 + i;
      expectClose(F[i]!, 0.9 * stdlibGumbel.cdf(x, 2, 11) + 0.1 * stdlibGumbel.cdf(x, 30, 45), 1e-13, `F(${x})`, 1e-15);
      expectClose(f[i]!, 0.9 * stdlibGumbel.pdf(x, 2, 11) + 0.1 * stdlibGumbel.pdf(x, 30, 45), 1e-13, `f(${x})`, 1e-15);
    }
  });

  it('evaluates survival at many nodes at once, within 1e-13 of survival(x) (@stdlib/stats-base-dists-gumbel)', () => {
    const mix = mixtureDistribution([gumbelDistribution(2, 11), gumbelDistribution(30, 45)], [0.9, 0.1]);
    const xs = Int32Array.from([-150, -10, 0, 40, 130, 370, 760, 1500]);
    const out = new Float64Array(xs.length).fill(7);
    mix.survivalAt!(xs, xs.length, out);
    xs.forEach((x, k) => {
      expect(Math.abs(out[k]! - mix.survival(x))).toBeLessThanOrEqual(1e-13 * mix.survival(x));
      expectClose(out[k]!, 0.9 * (1 - stdlibGumbel.cdf(x, 2, 11)) + 0.1 * (1 - stdlibGumbel.cdf(x, 30, 45)), 1e-12, `S(${x})`, 1e-15);
    });
    // Only the first count nodes are written.
    const few = new Float64Array(3).fill(7);
    mix.survivalAt!(xs, 2, few);
    expect(few[2]).toBe(7);
    const plain = without(gumbelDistribution(30, 45), 'addSurvivalAt');
    expect(mixtureDistribution([gumbelDistribution(2, 11), plain], [0.9, 0.1]).survivalAt).toBeUndefined();
  });

  it('offers no grid when a component has none', () => {
    const mix = mixtureDistribution([gumbelDistribution(2, 11), normalDistribution(30, 45)], [0.9, 0.1]);
    expect(mix.cdfGrid).toBeUndefined();
    expect(mix.pdfGrid).toBeUndefined();
  });
});
