import { describe, expect, it } from 'vitest';
import type { WeightedData } from '../../../../shared/inference/model';
import type { Rng } from '../../../../shared/inference/rng';
import { gumbelCdf, gumbelPdf, gumbelSurvival } from '../../../../shared/delay/gumbel';
import type { DelayDistribution } from '../../../../shared/delay/predictive';
import { logPredictiveDensity, qqTable, tailCalibration, type DrawSet } from '../../../../shared/delay/evaluation/scores';

/** Exponential delays with mean `scale` minutes: S(x) = exp(-x / scale) for x >= 0. */
function exponential(scale: number): DelayDistribution {
  return {
    cdf: (x) => (x <= 0 ? 0 : 1 - Math.exp(-x / scale)),
    survival: (x) => (x <= 0 ? 1 : Math.exp(-x / scale)),
    pdf: (x) => (x < 0 ? 0 : Math.exp(-x / scale) / scale),
    sample: (rng: Rng) => -scale * Math.log(rng.uniform()),
  };
}

function gumbel(mu: number, beta: number): DelayDistribution {
  return { cdf: (x) => gumbelCdf(x, mu, beta), survival: (x) => gumbelSurvival(x, mu, beta), pdf: (x) => gumbelPdf(x, mu, beta), sample: () => NaN };
}

function draws(...ds: DelayDistribution[]): DrawSet {
  return { drawCount: ds.length, draw: (s) => ds[s]! };
}

function weighted(rows: [group: number, value: number, count: number][]): WeightedData {
  return {
    groupCount: Math.max(...rows.map((r) => r[0])) + 1,
    group: Int32Array.from(rows, (r) => r[0]),
    value: Float64Array.from(rows, (r) => r[1]),
    count: Float64Array.from(rows, (r) => r[2]),
  };
}

describe('logPredictiveDensity', () => {
  it('gives -1 nat per flight for flights at 0 under a standard Gumbel (log density -1, NIST 1.3.6.6.16)', () => {
    const score = logPredictiveDensity(weighted([[0, 0, 3]]), () => draws(gumbel(0, 1)));
    expect(score.flights).toBe(3);
    expect(score.natsPerFlight).toBeCloseTo(-1, 12);
  });

  it('averages densities over draws before taking the log', () => {
    const a = exponential(10);
    const b = exponential(20);
    const score = logPredictiveDensity(weighted([[0, 5, 1], [1, 5, 1]]), (g) => (g === 0 ? draws(a, b) : draws(a)));
    const expected = (Math.log((a.pdf(5) + b.pdf(5)) / 2) + Math.log(a.pdf(5))) / 2;
    expect(score.natsPerFlight).toBeCloseTo(expected, 12);
  });

  it('is -Infinity when a flight gets zero density', () => {
    expect(logPredictiveDensity(weighted([[0, -5, 1]]), () => draws(exponential(10))).natsPerFlight).toBe(-Infinity);
  });
});

describe('tailCalibration', () => {
  // Group 0: delays 0, 20, 40, 40 (so 3/4 above 15 and 2/4 above 30); group 1: delays 100 x 2.
  const data = weighted([
    [0, 0, 1],
    [0, 20, 1],
    [0, 40, 2],
    [1, 100, 2],
  ]);

  it('compares observed and predicted exceedance pooled over flights, with the half-minute continuity offset', () => {
    const cal = tailCalibration(data, () => draws(exponential(10)), [15, 30], 50);
    const pooled15 = cal.pooled[0]!;
    expect(pooled15.observed).toBeCloseTo(5 / 6, 12);
    expect(pooled15.predicted).toBeCloseTo(Math.exp(-1.55), 12);
    expect(pooled15.relativeError).toBeCloseTo((Math.exp(-1.55) - 5 / 6) / (5 / 6), 12);
    expect(cal.pooled[1]!.observed).toBeCloseTo(4 / 6, 12);
  });

  it('gives the 5%-95% interval across draws and says whether it covers the observation', () => {
    const cal = tailCalibration(data, () => draws(exponential(10), exponential(1000)), [15], 50);
    const lo = Math.exp(-15.5 / 10);
    const hi = Math.exp(-15.5 / 1000);
    const row = cal.pooled[0]!;
    expect(row.interval[0]).toBeCloseTo(lo + 0.05 * (hi - lo), 12);
    expect(row.interval[1]).toBeCloseTo(lo + 0.95 * (hi - lo), 12);
    expect(row.predicted).toBeCloseTo((lo + hi) / 2, 12);
    expect(row.covered).toBe(true);
  });

  it('lists the busiest routes first and takes the median of their absolute relative errors', () => {
    const cal = tailCalibration(data, () => draws(exponential(10)), [15, 150], 2);
    expect(cal.routes.map((r) => r.group)).toEqual([0, 1]);
    const e0 = Math.abs(Math.exp(-1.55) / 0.75 - 1);
    const e1 = Math.abs(Math.exp(-1.55) / 1 - 1);
    expect(cal.routeMedianAbsRelativeError[0]!.median).toBeCloseTo((e0 + e1) / 2, 12);
    // Nothing observed above 150 minutes: the relative error is undefined and left out.
    expect(cal.routes[0]!.rows[1]!.relativeError).toBeNull();
    expect(cal.routeMedianAbsRelativeError[1]).toEqual({ minutes: 150, median: null, routes: 0 });
  });

  it('rejects empty data and groups with different draw counts', () => {
    expect(() => tailCalibration(weighted([]), () => draws(exponential(1)))).toThrow(/at least one flight/);
    expect(() => tailCalibration(data, (g) => (g === 0 ? draws(exponential(1)) : draws(exponential(1), exponential(2))))).toThrow(/same number of draws/);
  });
});

describe('qqTable', () => {
  it('matches the exponential quantile -scale * log(1 - p) and the weighted empirical quantile', () => {
    const data = weighted([
      [0, 1, 1],
      [0, 5, 2],
      [0, 9, 1],
    ]);
    const rows = qqTable(data, () => draws(exponential(10)), [0.25, 0.5, 0.9]);
    expect(rows.map((r) => r.observedMinutes)).toEqual([1, 5, 9]);
    for (const r of rows) expect(r.predictedMinutes).toBeCloseTo(-10 * Math.log(1 - r.probability), 2);
  });
});
