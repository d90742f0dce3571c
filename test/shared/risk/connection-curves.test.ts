import logistic from '@stdlib/stats-base-dists-logistic';
import { describe, expect, it } from 'vitest';
import { connectionPairFor, makeCurve, marginDistribution } from '../../../shared/risk/connection-curves';
import { pMakeAtLayover } from '../../../shared/risk/connection-probability';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const routes = { inbound: { from: 'ORD', to: 'DEN' }, outbound: { from: 'DEN', to: 'SFO' } };

describe('makeCurve', () => {
  it('charts P(make) from below the MCT up to near certainty, with the minimum layover on it', () => {
    const pair = connectionPairFor(syntheticSource(), routes);
    const curve = makeCurve(pair, { mctMinutes: 45, target: 0.9, intervalLevel: 0.9 });
    expect(curve.points[0]!.layoverMinutes).toBe(15);
    expect(curve.points.at(-1)!.pMake).toBeGreaterThan(0.99);
    const atMin = curve.points.find((p) => p.layoverMinutes === curve.minLayoverMinutes)!;
    expect(atMin.pMake).toBeGreaterThanOrEqual(0.9);
    expect(curve.points.find((p) => p.layoverMinutes === curve.minLayoverMinutes! - 1)!.pMake).toBeLessThan(0.9);
  });
});

describe('marginDistribution', () => {
  it('is the logistic distribution of layover - MCT - (A - D) for equal-scale Gumbels (@stdlib/stats-base-dists-logistic)', () => {
    // One draw, no parameter uncertainty: M = 15 - X with X ~ Logistic(9 - 4, 14), so P(M <= x) = 1 - F_X(15 - x).
    const source = syntheticSource({ draws: 1, routes: { 'ORD-DEN:arrival': { mu: 9, beta: 14 }, 'DEN-SFO:departure': { mu: 4, beta: 14 } } });
    const pair = connectionPairFor(source, routes);
    const dist = marginDistribution(pair, { layoverMinutes: 60, mctMinutes: 45, intervalLevel: 0.9 });
    dist.marginMinutes.forEach((x, i) => {
      expect(Math.abs(dist.cdf[i]! - (1 - logistic.cdf(15 - x, 5, 14)))).toBeLessThan(2e-5);
    });
    expect(dist.cdf[0]).toBeLessThan(0.002);
    expect(dist.cdf.at(-1)).toBeGreaterThan(0.998);
    const total = dist.probability.reduce((s, p) => s + p, 0);
    expect(total).toBeGreaterThan(0.995);
    expect(dist.pMake).toBe(pMakeAtLayover(pair, 60, 45));
  });

  it('gives a credible band around the cdf when parameters are uncertain', () => {
    const dist = marginDistribution(connectionPairFor(syntheticSource(), routes), { layoverMinutes: 60, mctMinutes: 45, intervalLevel: 0.9 });
    dist.cdf.forEach((c, i) => {
      expect(dist.cdfLo[i]!).toBeLessThanOrEqual(c + 1e-12);
      expect(dist.cdfHi[i]!).toBeGreaterThanOrEqual(c - 1e-12);
    });
    for (let i = 1; i < dist.cdf.length; i++) expect(dist.cdf[i]!).toBeGreaterThanOrEqual(dist.cdf[i - 1]!);
  });
});
