// The bundle's per-draw distribution evaluated a run of minutes at once (cdfGrid, pdfGrid, used
// by the risk tables) against its own point-by-point cdf and pdf, whose Gumbel part is checked
// against @stdlib/stats-base-dists-gumbel in test/shared/delay/gumbel.test.ts.
import { describe, expect, it } from 'vitest';
import stdlibGumbel from '@stdlib/stats-base-dists-gumbel';
import { TailMixtureDistribution } from '../../../../shared/delay/bundle/mixture-distribution';
import { FAMILY_PARAMETERS, LOMAX_START_MINUTES, type TailFamily } from '../../../../shared/delay/models/tail-mixture';
import { createRng } from '../../../../shared/inference/rng';

const FAMILIES = Object.keys(FAMILY_PARAMETERS) as TailFamily[];

function randomEta(family: TailFamily, seed: number): number[] {
  const rng = createRng(seed);
  // Locations in minutes, log scales around 1.5-3.5 (4.5 to 33 minutes), logits around -1.5.
  return FAMILY_PARAMETERS[family].map((_, j) => (j === 0 || j === 2 ? 20 * rng.normal() : j === 4 || j === 7 ? -1.5 + rng.normal() : 2.5 + 0.5 * rng.normal()));
}

describe.each(FAMILIES)('TailMixtureDistribution %s on a grid', (family) => {
  it.each([
    { lo: -120, n: 600, shift: 0, seed: 1 },
    { lo: -2880, n: 3000, shift: 6.1, seed: 2 },
    { lo: 37, n: 5, shift: -3, seed: 3 },
  ])('matches cdf and pdf minute by minute from $lo ($n minutes, shift $shift)', ({ lo, n, shift, seed }) => {
    const dist = new TailMixtureDistribution(family, randomEta(family, seed), 4, shift);
    const F = new Float64Array(n);
    const f = new Float64Array(n);
    dist.cdfGrid(lo, F);
    dist.pdfGrid(lo, f);
    for (let i = 0; i < n; i++) {
      const x = lo + i;
      const cdf = dist.cdf(x);
      const pdf = dist.pdf(x);
      // 1e-10 absolute, the grid evaluation contract (shared/delay/predictive.ts).
      if (!(Math.abs(F[i]! - cdf) <= 1e-10)) throw new Error(`${family} F(${x}): grid ${F[i]}, point ${cdf}`);
      if (!(Math.abs(f[i]! - pdf) <= 1e-10)) throw new Error(`${family} f(${x}): grid ${f[i]}, point ${pdf}`);
    }
    expect(F.every((v) => Number.isFinite(v))).toBe(true);
  });
});

describe.each(FAMILIES)('TailMixtureDistribution %s at scattered nodes', (family) => {
  it('gives survival(x) at each node within 1e-13 relative (survivalAt)', () => {
    const dist = new TailMixtureDistribution(family, randomEta(family, 5), 4, 6.1);
    const xs = Int32Array.from([-2880, -60, -1, 0, 7, 45, 180, 600, 1440, 2880, 7200]);
    const out = new Float64Array(xs.length);
    dist.survivalAt(xs, xs.length, out);
    xs.forEach((x, k) => expect(Math.abs(out[k]! - dist.survival(x)), `S(${x})`).toBeLessThanOrEqual(1e-13 * dist.survival(x)));
  });
});

describe.each(FAMILIES)('TailMixtureDistribution %s on a half-minute grid', (family) => {
  it('matches cdf and pdf at every half minute', () => {
    const dist = new TailMixtureDistribution(family, randomEta(family, 4), 4, 6.1);
    const lo = -200.5;
    const F = new Float64Array(1200);
    const f = new Float64Array(1200);
    dist.cdfGrid(lo, F, 0.5);
    dist.pdfGrid(lo, f, 0.5);
    for (let i = 0; i < F.length; i++) {
      const x = lo + i / 2;
      expect(Math.abs(F[i]! - dist.cdf(x))).toBeLessThanOrEqual(1e-12);
      expect(Math.abs(f[i]! - dist.pdf(x))).toBeLessThanOrEqual(1e-15 + 1e-11 * dist.pdf(x));
    }
  });
});

describe('TailMixtureDistribution, a wide Lomax component', () => {
  // lambda = 600 minutes: wide enough that the grid steps it by its series between exact points.
  const eta = [5, Math.log(12), 30, Math.log(40), -1, Math.log(600), Math.log(2.4), 0];
  const dist = new TailMixtureDistribution('gumbel-gumbel-lomax', eta, 4, 6.1);

  it('keeps the grid within 1e-10 of the point values over two days', () => {
    const F = new Float64Array(3000);
    const f = new Float64Array(3000);
    dist.cdfGrid(-120, F);
    dist.pdfGrid(-120, f);
    for (let i = 0; i < F.length; i++) {
      expect(Math.abs(F[i]! - dist.cdf(-120 + i))).toBeLessThanOrEqual(1e-10);
      expect(Math.abs(f[i]! - dist.pdf(-120 + i))).toBeLessThanOrEqual(1e-10);
    }
  });

  it('declares the jump at its start that the density shows (one-sided finite differences)', () => {
    const [[at, jump, slopeJump]] = dist.densityJumps() as [[number, number, number]];
    expect(at).toBeCloseTo(-0.5 + 6.1, 12);
    // One-sided limits and slopes from points on each side, extrapolated to the start; the
    // smooth components' curvature, estimated on the left, is taken out of the slopes.
    const h = 1e-3;
    const f = (x: number) => dist.pdf(x);
    const curvature = (f(at - h) - 2 * f(at - 2 * h) + f(at - 3 * h)) / (h * h);
    const rightSlope = (f(at + 2 * h) - f(at + h)) / h - 1.5 * h * curvature;
    const leftSlope = (f(at - h) - f(at - 2 * h)) / h + 1.5 * h * curvature;
    const right = f(at + h) - h * rightSlope;
    const left = f(at - h) + h * leftSlope;
    expect(Math.abs(right - left - jump)).toBeLessThanOrEqual(1e-6 * jump);
    expect(Math.abs(rightSlope - leftSlope - slopeJump)).toBeLessThanOrEqual(1e-2 * Math.abs(slopeJump));
  });
});

describe('TailMixtureDistribution on a grid, extreme draws', () => {
  it('stays finite and equal to the point values for a typical scale of 0.03 minutes', () => {
    // A population draw can be this narrow; far below its location e^{-z} overflows.
    const eta = [2, Math.log(0.03), 30, Math.log(25), -1.5, Math.log(40), Math.log(1.2), -1];
    const dist = new TailMixtureDistribution('gumbel-gumbel-lomax', eta, 4, 6.1);
    const f = new Float64Array(600);
    const F = new Float64Array(600);
    dist.pdfGrid(-300, f);
    dist.cdfGrid(-300, F);
    f.forEach((v, i) => expect(Math.abs(v - dist.pdf(-300 + i))).toBeLessThanOrEqual(1e-15 + 1e-11 * dist.pdf(-300 + i)));
    F.forEach((v, i) => expect(Math.abs(v - dist.cdf(-300 + i))).toBeLessThanOrEqual(1e-12));
  });
});

describe.each(FAMILIES)('TailMixtureDistribution %s sampled', (family) => {
  // Kolmogorov-Smirnov against the distribution's own cdf (whose parts are checked above and in
  // gumbel.test.ts): with n = 20,000, sup |F_n - F| exceeds 1.95 / sqrt(n) with probability
  // about 0.001 (Smirnov's asymptotic distribution).
  it('draws from its distribution', () => {
    const dist = new TailMixtureDistribution(family, randomEta(family, 17), 4, 6.1);
    const rng = createRng(29);
    const n = 20_000;
    const xs = Float64Array.from({ length: n }, () => dist.sample(rng)).sort();
    let d = 0;
    xs.forEach((x, i) => {
      const F = dist.cdf(x);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    });
    expect(d).toBeLessThan(1.95 / Math.sqrt(n));
  });
});

describe.each(FAMILIES)('TailMixtureDistribution %s sampled in place', (family) => {
  it('gives the values of sample() called in turn, capped, at every stride-th place only', () => {
    const dist = new TailMixtureDistribution(family, randomEta(family, 11), 4, 2);
    const out = new Float64Array(3001).fill(-1);
    dist.sampleInto(createRng(9), out, 2, 3, 30);
    const rng = createRng(9);
    for (let i = 0; i < out.length; i++) expect(out[i]).toBe(i % 3 === 2 ? Math.min(30, dist.sample(rng)) : -1);
    expect(out.some((v) => v === 30)).toBe(true);
  });
});

describe('TailMixtureDistribution, the Lomax grid recurrence', () => {
  // Narrow (lambda 30, alpha 3: exact near the start, stepped farther out), heavy (alpha 0.5)
  // and wide (lambda 600): each within 1e-12 of its point values over two days, tighter than
  // the 1e-10 contract, since the series is only used where it is exact to rounding.
  it.each([
    { lambda: 30, alpha: 3 },
    { lambda: 30, alpha: 0.5 },
    { lambda: 600, alpha: 2.4 },
    { lambda: 4, alpha: 8 },
  ])('lambda $lambda, alpha $alpha', ({ lambda, alpha }) => {
    const dist = new TailMixtureDistribution('gumbel-lomax', [5, Math.log(12), Math.log(lambda), Math.log(alpha), -1], 4, 0);
    const F = new Float64Array(2900);
    const f = new Float64Array(2900);
    dist.cdfGrid(-20, F);
    dist.pdfGrid(-20, f);
    for (let i = 0; i < F.length; i++) {
      const x = -20 + i;
      if (!(Math.abs(F[i]! - dist.cdf(x)) <= 1e-12)) throw new Error(`F(${x}): grid ${F[i]}, point ${dist.cdf(x)}`);
      if (!(Math.abs(f[i]! - dist.pdf(x)) <= 1e-12 * Math.max(1e-3, dist.pdf(x)))) throw new Error(`f(${x}): grid ${f[i]}, point ${dist.pdf(x)}`);
    }
  });
});

describe('TailMixtureDistribution point by point', () => {
  // The three-part family written out from its parameters (FAMILY_PARAMETERS): the Gumbel parts'
  // CDF from @stdlib/stats-base-dists-gumbel, the Lomax survival (1 + v)^-alpha by Math.pow, a
  // different evaluation from the distribution's exp and log1p.
  const sigmoid = (x: number) => 1 / (1 + Math.exp(-x));
  it.each([0, 6.1])('gives the weighted sum of its parts as cdf and survival (shift %d)', (shift) => {
    const eta = [-4, Math.log(11), 30, Math.log(40), -1.2, Math.log(35), Math.log(1.6), -0.8];
    const dist = new TailMixtureDistribution('gumbel-gumbel-lomax', eta, 4, shift);
    const w = sigmoid(eta[4]!);
    const v = sigmoid(eta[7]!);
    for (let x = -200; x <= 3000; x += 7.25) {
      const lomaxS = x <= LOMAX_START_MINUTES + shift ? 1 : Math.pow(1 + (x - LOMAX_START_MINUTES - shift) / Math.exp(eta[5]!), -Math.exp(eta[6]!));
      const cdf =
        (1 - w) * stdlibGumbel.cdf(x, eta[0]! + shift, Math.exp(eta[1]!)) + w * (1 - v) * stdlibGumbel.cdf(x, eta[2]! + shift, Math.exp(eta[3]!)) + w * v * (1 - lomaxS);
      const survival = 1 - cdf;
      expect(Math.abs(dist.cdf(x) - cdf), `F(${x})`).toBeLessThanOrEqual(1e-13);
      // The upper tail relative to its size (the sum above loses it once 1 - F is tiny).
      if (survival > 1e-3) expect(Math.abs(dist.survival(x) - survival), `S(${x})`).toBeLessThanOrEqual(1e-12 * survival);
      else expect(Math.abs(dist.survival(x) - survival), `S(${x})`).toBeLessThanOrEqual(1e-13);
    }
    expect(dist.cdf(Number.NaN)).toBeNaN();
    expect(dist.cdf(-Infinity)).toBe(0);
    expect(dist.cdf(Infinity)).toBe(1);
    expect(dist.survival(Infinity)).toBe(0);
  });
});
