// Reference: @stdlib/stats-base-dists-gumbel (a general-purpose statistics library) for the
// distribution functions; NIST/SEMATECH e-Handbook 1.3.6.6.16 for mean mu + gamma*beta and
// variance pi^2 beta^2 / 6.
import { describe, expect, it } from 'vitest';
import stdlibGumbel from '@stdlib/stats-base-dists-gumbel';
import {
  EULER_GAMMA,
  EXP_NEGATIVE_MAX,
  expNegative,
  gumbelCdf,
  gumbelDistribution,
  gumbelExponentialSample,
  gumbelLogPdf,
  gumbelMean,
  gumbelPdf,
  gumbelQuantile,
  gumbelSample,
  gumbelSurvival,
  gumbelVariance,
  oneMinusExpNeg,
} from '../../../shared/delay/gumbel';
import { createRng } from '../../../shared/inference/rng';
import { expectClose } from './close';

const PARAMS: [number, number][] = [[0, 1], [-4.5, 11], [30, 60], [1e3, 0.01]];
const ZS = [-3, -1.5, -0.2, 0, 0.7, 2, 5, 12, 30];

describe('Gumbel against @stdlib/stats-base-dists-gumbel', () => {
  it.each(PARAMS)('log density, density, CDF and quantile agree for mu=%d, beta=%d', (mu, beta) => {
    for (const z of ZS) {
      const x = mu + beta * z;
      expectClose(gumbelLogPdf(x, mu, beta), stdlibGumbel.logpdf(x, mu, beta), 1e-12, `logpdf(${x}; ${mu}, ${beta})`);
      expectClose(gumbelPdf(x, mu, beta), stdlibGumbel.pdf(x, mu, beta), 1e-12, `pdf(${x}; ${mu}, ${beta})`);
      expectClose(gumbelCdf(x, mu, beta), stdlibGumbel.cdf(x, mu, beta), 1e-12, `cdf(${x}; ${mu}, ${beta})`);
    }
    for (const p of [1e-12, 1e-4, 0.05, 0.3665, 0.5, 0.9, 0.999, 1 - 1e-9]) {
      expectClose(gumbelQuantile(p, mu, beta), stdlibGumbel.quantile(p, mu, beta), 1e-9, `quantile(${p}; ${mu}, ${beta})`, 1e-9 * beta);
    }
    expectClose(gumbelMean(mu, beta), stdlibGumbel.mean(mu, beta), 1e-14, 'mean');
    expectClose(gumbelVariance(mu, beta), stdlibGumbel.variance(mu, beta), 1e-14, 'variance');
  });

  it('keeps relative precision in the right tail where 1 - cdf would cancel', () => {
    // For large z, P(X > x) = 1 - exp(-e^-z) ~ e^-z - e^-2z / 2.
    const z = 40;
    const exact = Math.exp(-z) - Math.exp(-2 * z) / 2;
    expectClose(gumbelSurvival(z, 0, 1), exact, 1e-12, 'survival(40)');
    expect(1 - stdlibGumbel.cdf(z, 0, 1)).toBe(0);
  });
});

describe('oneMinusExpNeg, the survival of a Gumbel given t = e^{-z}', () => {
  it('agrees with Math.expm1 to within an ulp on both sides of its series threshold, and with 1 - stdlib cdf in the bulk', () => {
    const rng = createRng(8);
    for (let k = 0; k < 20_000; k++) {
      // Log-uniform t from 1e-300 to 1: the series (t < 1/32) and expm1 both.
      const t = Math.exp(-690 * rng.uniform() ** 2);
      const exact = -Math.expm1(-t);
      expectClose(oneMinusExpNeg(t), exact, 2.3e-16, `1 - e^-${t}`);
    }
    for (const z of [-2, 0, 1, 3, 3.4657, 3.4658, 6]) expectClose(gumbelSurvival(z, 0, 1), 1 - stdlibGumbel.cdf(z, 0, 1), 1e-9, `survival(${z})`, 1e-15);
    expect(oneMinusExpNeg(0)).toBe(0);
    expect(oneMinusExpNeg(Infinity)).toBe(1);
    expect(oneMinusExpNeg(Number.NaN)).toBeNaN();
  });
});

describe('expNegative, the table-based e^{-t} of the grids', () => {
  it('agrees with Math.exp to 3e-14 relative over its whole range, table points and between', () => {
    const rng = createRng(9);
    const ts = [0, 1 / 64, 0.5, 1, 35.99, EXP_NEGATIVE_MAX, ...Array.from({ length: 20_000 }, () => EXP_NEGATIVE_MAX * rng.uniform())];
    for (const t of ts) expectClose(expNegative(t), Math.exp(-t), 3e-14, `e^-${t}`);
    expect(expNegative(0)).toBe(1);
  });
});

describe('Gumbel closed forms (NIST/SEMATECH e-Handbook 1.3.6.6.16)', () => {
  it('has mean mu + gamma*beta and variance pi^2 beta^2 / 6, and sample moments match them', () => {
    const mu = -4;
    const beta = 12;
    expect(gumbelMean(mu, beta)).toBeCloseTo(mu + EULER_GAMMA * beta, 12);
    expect(gumbelVariance(mu, beta)).toBeCloseTo((Math.PI ** 2 * beta ** 2) / 6, 10);
    const rng = createRng(17);
    const n = 200_000;
    let s = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const x = gumbelSample(rng, mu, beta);
      s += x;
      ss += x * x;
    }
    const mean = s / n;
    const variance = ss / n - mean * mean;
    const sd = Math.sqrt(gumbelVariance(mu, beta));
    // Standard error of the mean sd/sqrt(n); of the variance about sd^2 sqrt((kurtosis - 1)/n), Gumbel excess kurtosis 2.4.
    expect(Math.abs(mean - gumbelMean(mu, beta))).toBeLessThan((4 * sd) / Math.sqrt(n));
    expect(Math.abs(variance / gumbelVariance(mu, beta) - 1)).toBeLessThan(4 * Math.sqrt(4.4 / n));
  });

  it('inverts: quantile(cdf(x)) = x', () => {
    for (const x of [-20, -3, 0, 7, 45, 200]) expectClose(gumbelQuantile(gumbelCdf(x, 5, 15), 5, 15), x, 1e-9, `x=${x}`, 1e-9);
  });
});

describe('Gumbel edge-case contract', () => {
  it('returns NaN for NaN arguments and invalid parameters', () => {
    for (const f of [gumbelLogPdf, gumbelPdf, gumbelCdf, gumbelSurvival]) {
      expect(f(NaN, 0, 1)).toBeNaN();
      expect(f(0, NaN, 1)).toBeNaN();
      expect(f(0, 0, 0)).toBeNaN();
      expect(f(0, 0, -1)).toBeNaN();
      expect(f(0, 0, Infinity)).toBeNaN();
      expect(f(0, Infinity, 1)).toBeNaN();
    }
    expect(gumbelQuantile(-0.1, 0, 1)).toBeNaN();
    expect(gumbelQuantile(1.1, 0, 1)).toBeNaN();
    expect(gumbelSample(createRng(1), 0, -1)).toBeNaN();
    expect(gumbelMean(0, 0)).toBeNaN();
    expect(gumbelVariance(0, -2)).toBeNaN();
  });

  it('gives the limits at infinite x and p of 0 or 1', () => {
    expect(gumbelCdf(Infinity, 0, 1)).toBe(1);
    expect(gumbelCdf(-Infinity, 0, 1)).toBe(0);
    expect(gumbelSurvival(Infinity, 0, 1)).toBe(0);
    expect(gumbelSurvival(-Infinity, 0, 1)).toBe(1);
    expect(gumbelLogPdf(Infinity, 0, 1)).toBe(-Infinity);
    expect(gumbelPdf(-Infinity, 0, 1)).toBe(0);
    expect(gumbelQuantile(0, 0, 1)).toBe(-Infinity);
    expect(gumbelQuantile(1, 0, 1)).toBe(Infinity);
  });

  it('gumbelDistribution throws on invalid parameters and otherwise matches the functions', () => {
    expect(() => gumbelDistribution(0, 0)).toThrow(RangeError);
    const d = gumbelDistribution(3, 9);
    expect(d.cdf(10)).toBe(gumbelCdf(10, 3, 9));
    expect(d.survival(100)).toBe(gumbelSurvival(100, 3, 9));
    expect(d.pdf(-2)).toBe(gumbelPdf(-2, 3, 9));
    expect(d.sample(createRng(4))).toBe(gumbelExponentialSample(createRng(4), 3, 9));
  });

  // Kolmogorov-Smirnov: with n = 50,000 draws, sup |F_n - F| exceeds 1.95 / sqrt(n) with
  // probability about 0.001 under the true F (Smirnov's asymptotic distribution).
  it.each([
    ['gumbelSample (inversion)', gumbelSample],
    ['gumbelExponentialSample (ziggurat exponential)', gumbelExponentialSample],
  ] as const)('%s draws from the Gumbel (KS against @stdlib/stats-base-dists-gumbel)', (_name, draw) => {
    const rng = createRng(41);
    const n = 50_000;
    const xs = Float64Array.from({ length: n }, () => draw(rng, 4, 13)).sort();
    let d = 0;
    xs.forEach((x, i) => {
      const F = stdlibGumbel.cdf(x, 4, 13);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    });
    expect(d).toBeLessThan(1.95 / Math.sqrt(n));
  });
});

describe('gumbelDistribution sampled in place', () => {
  it('gives the draws of sample() in turn, capped, at every stride-th place only', () => {
    const out = new Float64Array(1000).fill(-1);
    gumbelDistribution(5, 20).sampleInto!(createRng(12), out, 0, 4, 40);
    const rng = createRng(12);
    const dist = gumbelDistribution(5, 20);
    for (let i = 0; i < out.length; i++) expect(out[i]).toBe(i % 4 === 0 ? Math.min(40, dist.sample(rng)) : -1);
  });
});

describe('Gumbel on a grid (the risk tables use it) against @stdlib/stats-base-dists-gumbel', () => {
  it.each([
    { mu: 5, beta: 12, lo: -200, step: 1 },
    { mu: -3, beta: 0.7, lo: -20.25, step: 0.5 },
  ])('cdfGrid and pdfGrid match at every point (mu $mu, beta $beta, step $step)', ({ mu, beta, lo, step }) => {
    const dist = gumbelDistribution(mu, beta);
    const F = new Float64Array(900);
    const f = new Float64Array(900);
    dist.cdfGrid!(lo, F, step);
    dist.pdfGrid!(lo, f, step);
    for (let i = 0; i < F.length; i++) {
      const x = lo + i * step;
      expect(Math.abs(F[i]! - stdlibGumbel.cdf(x, mu, beta))).toBeLessThanOrEqual(1e-13);
      expect(Math.abs(f[i]! - stdlibGumbel.pdf(x, mu, beta))).toBeLessThanOrEqual(1e-13 * Math.max(1, stdlibGumbel.pdf(x, mu, beta)));
    }
  });

  it('survivalAt gives survival at each node within 1e-13 relative, and 1 - F within 1e-13 (@stdlib/stats-base-dists-gumbel)', () => {
    const dist = gumbelDistribution(5, 12);
    const xs = Int32Array.from([-200, -30, 0, 5, 17, 60, 240, 480, 900]);
    const out = new Float64Array(xs.length + 1).fill(-1);
    dist.survivalAt!(xs, xs.length, out);
    xs.forEach((x, k) => {
      expect(Math.abs(out[k]! - dist.survival(x))).toBeLessThanOrEqual(1e-13 * dist.survival(x));
      expect(Math.abs(out[k]! - (1 - stdlibGumbel.cdf(x, 5, 12)))).toBeLessThanOrEqual(1e-13);
    });
    // Far in the tail S keeps its relative precision, which 1 - F loses: S(480) = -expm1(-e^{-z}).
    expect(out[7]! / -Math.expm1(-Math.exp(-(480 - 5) / 12))).toBeCloseTo(1, 14);
    expect(out[xs.length]).toBe(-1);
    const added = new Float64Array(xs.length).fill(0.5);
    dist.addSurvivalAt!(xs, xs.length, added, 0.25);
    xs.forEach((x, k) => expect(Math.abs(added[k]! - (0.5 + 0.25 * dist.survival(x)))).toBeLessThanOrEqual(1e-15));
  });

  it('survivalAt steps e^{-z} along evenly spaced tail nodes to within 1e-13 of survival, relative', () => {
    // Tail nodes as the risk tables place them: steps growing from 2 minutes, then constant.
    const dist = gumbelDistribution(-3, 9.5);
    const xs = new Int32Array(60);
    for (let k = 0, x = 20, h = 2; k < xs.length; k++, x += h, h = Math.min(13, Math.ceil(h * 1.5))) xs[k] = x;
    const out = new Float64Array(xs.length);
    dist.survivalAt!(xs, xs.length, out);
    xs.forEach((x, k) => {
      const s = dist.survival(x);
      expect(Math.abs(out[k]! - s), `S(${x})`).toBeLessThanOrEqual(1e-13 * s);
      expect(Math.abs(out[k]! - (1 - stdlibGumbel.cdf(x, -3, 9.5)))).toBeLessThanOrEqual(1e-13);
    });
  });

  it('addGrid adds weight times F or f onto what the row holds', () => {
    const dist = gumbelDistribution(5, 12);
    const F = new Float64Array(400).fill(0.25);
    const f = new Float64Array(400).fill(0.25);
    dist.addGrid!(-100, F, 1, 0.3, false);
    dist.addGrid!(-100, f, 1, 0.3, true);
    for (let i = 0; i < F.length; i++) {
      const x = -100 + i;
      expect(Math.abs(F[i]! - (0.25 + 0.3 * stdlibGumbel.cdf(x, 5, 12)))).toBeLessThanOrEqual(1e-13);
      expect(Math.abs(f[i]! - (0.25 + 0.3 * stdlibGumbel.pdf(x, 5, 12)))).toBeLessThanOrEqual(1e-13);
    }
  });
});
