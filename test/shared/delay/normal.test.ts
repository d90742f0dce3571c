// Reference: @stdlib/stats-base-dists-normal (a general-purpose statistics library).
import { describe, expect, it } from 'vitest';
import stdlibNormal from '@stdlib/stats-base-dists-normal';
import { normalCdf, normalDistribution, normalLogPdf, normalMean, normalPdf, normalQuantile, normalSample, normalSurvival, normalVariance } from '../../../shared/delay/normal';
import { createRng } from '../../../shared/inference/rng';
import { expectClose } from './close';

const PARAMS: [number, number][] = [[0, 1], [-7, 0.3], [45, 60]];
const ZS = [-37, -20, -8, -3.2, -3, -2.5, -1, -0.1, 0, 0.4, 1.96, 2.99, 3, 4, 9, 25];

describe('Normal against @stdlib/stats-base-dists-normal', () => {
  it.each(PARAMS)('log density, density, CDF and survival agree for mu=%d, sigma=%d', (mu, sigma) => {
    for (const z of ZS) {
      const x = mu + sigma * z;
      expectClose(normalLogPdf(x, mu, sigma), stdlibNormal.logpdf(x, mu, sigma), 1e-12, `logpdf(${x})`);
      expectClose(normalPdf(x, mu, sigma), stdlibNormal.pdf(x, mu, sigma), 1e-11, `pdf(${x})`);
      expectClose(normalCdf(x, mu, sigma), stdlibNormal.cdf(x, mu, sigma), 1e-12, `cdf(${x})`);
      // Survival by symmetry of the reference: P(X > x) = cdf(2 mu - x).
      expectClose(normalSurvival(x, mu, sigma), stdlibNormal.cdf(2 * mu - x, mu, sigma), 1e-12, `survival(${x})`);
    }
  });

  it.each(PARAMS)('quantile agrees for mu=%d, sigma=%d', (mu, sigma) => {
    for (const p of [1e-200, 1e-20, 1e-6, 0.001, 0.02425, 0.1, 0.5, 0.8, 0.97575, 0.999, 1 - 1e-12]) {
      expectClose(normalQuantile(p, mu, sigma), stdlibNormal.quantile(p, mu, sigma), 1e-11, `quantile(${p})`, 1e-12 * sigma);
    }
  });

  it('has the stated mean and variance and sample moments match them', () => {
    expect(normalMean(3, 2)).toBe(stdlibNormal.mean(3, 2));
    expect(normalVariance(3, 2)).toBe(stdlibNormal.variance(3, 2));
    const rng = createRng(5);
    const n = 100_000;
    let s = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const x = normalSample(rng, 3, 2);
      s += x;
      ss += x * x;
    }
    const m = s / n;
    expect(Math.abs(m - 3)).toBeLessThan((4 * 2) / Math.sqrt(n));
    expect(Math.abs((ss / n - m * m) / 4 - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
  });
});

describe('Normal edge-case contract', () => {
  it('returns NaN for NaN arguments and invalid parameters', () => {
    for (const f of [normalLogPdf, normalPdf, normalCdf, normalSurvival]) {
      expect(f(NaN, 0, 1)).toBeNaN();
      expect(f(0, NaN, 1)).toBeNaN();
      expect(f(0, 0, 0)).toBeNaN();
      expect(f(0, 0, -1)).toBeNaN();
      expect(f(0, -Infinity, 1)).toBeNaN();
    }
    expect(normalQuantile(NaN, 0, 1)).toBeNaN();
    expect(normalQuantile(2, 0, 1)).toBeNaN();
    expect(normalSample(createRng(1), 0, 0)).toBeNaN();
    expect(() => normalDistribution(0, -1)).toThrow(RangeError);
  });

  it('gives the limits at infinite x and p of 0 or 1', () => {
    expect(normalCdf(-Infinity, 0, 1)).toBe(0);
    expect(normalCdf(Infinity, 0, 1)).toBe(1);
    expect(normalSurvival(Infinity, 0, 1)).toBe(0);
    expect(normalLogPdf(Infinity, 0, 1)).toBe(-Infinity);
    expect(normalQuantile(0, 0, 1)).toBe(-Infinity);
    expect(normalQuantile(1, 0, 1)).toBe(Infinity);
  });
});
