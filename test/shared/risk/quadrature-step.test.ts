// Departure density tables with a step of 2 or 4 minutes (shared/risk/delay-table.ts), the step
// each pair of draws gets (quadratureStep), and the correction for a kink in the arrival CDF
// (finishSum in shared/risk/connection-probability.ts).
import logistic from '@stdlib/stats-base-dists-logistic';
import { describe, expect, it } from 'vitest';
import { TailMixtureDistribution } from '../../../shared/delay/bundle/mixture-distribution';
import { mixtureDistribution } from '../../../shared/delay/mixture';
import type { DelayDistribution, RoutePosterior } from '../../../shared/delay/predictive';
import { ConnectionPair, drawMakeProbability, drawMakeProbabilityPair, quadratureStep } from '../../../shared/risk/connection-probability';
import { DrawTable, RouteTables } from '../../../shared/risk/delay-table';
import { gumbelDelay, gumbelRoute } from '../../fixtures/risk/synthetic-source';

function closeTo(actual: number, expected: number, tol: number, what: string): void {
  if (!(Math.abs(actual - expected) <= tol)) throw new Error(`${what}: expected ${expected}, got ${actual}, |diff| ${Math.abs(actual - expected)} > tol ${tol}`);
}

/**
 * Reference: P(A - D <= m) = integral f_D(x) F_A(m + x) dx by Simpson's rule in pieces that end
 * at D's density jumps and at A's (F_A's kinks, at x = jump - m), 32 points per minute to 600
 * minutes and 1 per minute beyond, to 8000 minutes, plus S_D(8000): the distribution functions
 * themselves, no tables.
 */
function reference(a: DelayDistribution, d: DelayDistribution, m: number): number {
  const breaks = [-300, 600, 8000];
  for (const [x] of (d as TailMixtureDistribution).densityJumps?.() ?? []) breaks.push(x);
  for (const [x] of (a as TailMixtureDistribution).densityJumps?.() ?? []) breaks.push(x - m);
  breaks.sort((x, y) => x - y);
  let sum = 0;
  for (let k = 0; k + 1 < breaks.length; k++) {
    const lo = breaks[k]!;
    const hi = breaks[k + 1]!;
    if (!(hi > lo)) continue;
    const n = Math.max(4, Math.ceil((hi - lo) * (hi <= 600 ? 32 : 1)));
    const h = (hi - lo) / n;
    const g = (x: number) => d.pdf(x) * a.cdf(m + x);
    // Inside the piece, just off its ends, so each side of a jump is evaluated on its own side.
    for (let i = 0; i < n; i++) {
      const x0 = lo + i * h + 1e-9;
      const x1 = lo + (i + 1) * h - 1e-9;
      sum += ((x1 - x0) / 6) * (g(x0) + 4 * g((x0 + x1) / 2) + g(x1));
    }
  }
  return sum + d.survival(8000);
}

// A draw of the bundled family (typical Gumbel, disrupted Gumbel, severe Lomax from -0.5 minutes).
function tailMixture(eta: number[], shift: number): TailMixtureDistribution {
  return new TailMixtureDistribution('gumbel-gumbel-lomax', eta, NaN, shift);
}

const MARGINS = [-60, -20, -5, 0, 5, 20, 45, 90, 200];

describe('departure density tables with a coarser step', () => {
  // A, D ~ Gumbel with equal scale beta => A - D ~ Logistic(muA - muD, beta), a standard result on
  // differences of Gumbel variables; CDF from @stdlib/stats-base-dists-logistic.
  it.each([
    { step: 4, beta: 10 },
    { step: 4, beta: 25 },
    { step: 2, beta: 5 },
    { step: 2, beta: 12 },
  ])('match the logistic closed form at step $step for Gumbels of scale $beta (@stdlib/stats-base-dists-logistic)', ({ step, beta }) => {
    const arr = new DrawTable(gumbelDelay(5, beta), 'cdf');
    const dep = new DrawTable(gumbelDelay(2, beta), 'density', undefined, step);
    const fine = new DrawTable(gumbelDelay(2, beta), 'density');
    expect(dep.step).toBe(step);
    expect(dep.coreLength).toBeLessThanOrEqual(Math.ceil(fine.coreLength / step) + 1);
    for (const m of MARGINS) closeTo(drawMakeProbability(arr, dep, m), logistic.cdf(m, 3, beta), 2e-5, `m=${m}`);
  });

  it('integrate a severe component that starts between two minutes (declared jump) within 2e-5 at step 2', () => {
    const arr = new DrawTable(gumbelDelay(0, 7), 'cdf');
    // A severe share of over half, as some population draws have: the jump is 0.019 per minute.
    const d = tailMixture([1.9, Math.log(10.5), 23.8, Math.log(31.9), 0.62, Math.log(90.9), Math.log(3.1), 4.7], 6.1);
    const dep = new DrawTable(d, 'density', undefined, 2);
    expect(dep.cellMasses).toBe(false);
    for (const m of MARGINS) closeTo(drawMakeProbability(arr, dep, m), reference(arr.dist, d, m), 2e-5, `m=${m}`);
  });

  it('correct for a kink in the arrival CDF (a severe component starting at -0.5 minutes), at steps 1 and 2', () => {
    const a = tailMixture([-9.5, Math.log(9.4), 17.3, Math.log(32.7), 0.5, Math.log(46.6), Math.log(5.8), 3.3], 0);
    const arr = new DrawTable(a, 'cdf');
    expect(arr.kinks[0]).toBe(-0.5);
    const d = gumbelDelay(2, 10.5);
    // (Steps 1 and 2: quadratureStep keeps a pair with a jump off step 4, where the third-order
    // term left was 8e-5 here.)
    for (const step of [1, 2]) {
      const dep = new DrawTable(d, 'density', undefined, step);
      // Uncorrected, step 1 was off by 1.1e-4 here.
      for (const m of MARGINS) closeTo(drawMakeProbability(arr, dep, m), reference(a, d, m), 3e-5, `step ${step}, m=${m}`);
    }
  });

  it('keep P(make) monotone in the margin and the two-margin pass equal to single margins', () => {
    const a = tailMixture([-6.7, Math.log(8.3), 18.3, Math.log(26.5), -1.4, Math.log(76.5), Math.log(3.2), -1.3], 0);
    const d = tailMixture([-3, Math.log(9), 15, Math.log(30), -1.3, Math.log(70), Math.log(3), -1.5], 6.1);
    const arr = new DrawTable(a, 'cdf');
    for (const step of [2, 4]) {
      const dep = new DrawTable(d, 'density', undefined, step);
      let previous = -1;
      for (let m = -120; m <= 600; m++) {
        const p = drawMakeProbability(arr, dep, m);
        expect(p, `step ${step}, m=${m}`).toBeGreaterThanOrEqual(previous);
        previous = p;
      }
      const out0 = new Float64Array(1);
      const out1 = new Float64Array(1);
      for (const [m0, m1] of [[-30, -29], [10, 47], [-200, 300]] as const) {
        drawMakeProbabilityPair(arr, dep, m0, m1, out0, out1, 0);
        expect(out0[0]).toBe(drawMakeProbability(arr, dep, m0));
        expect(out1[0]).toBe(drawMakeProbability(arr, dep, m1));
      }
    }
  });

  it('reject a step other than 1, 2 or 4, and any step over 1 for a CDF table', () => {
    expect(() => new DrawTable(gumbelDelay(0, 9), 'density', undefined, 3)).toThrow(RangeError);
    expect(() => new DrawTable(gumbelDelay(0, 9), 'cdf', undefined, 2)).toThrow(/step must be 1/);
    const arrivals = new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', [{ mu: 0, beta: 9 }]), 1);
    expect(() => arrivals.table(0, 2)).toThrow(/no arrival table with a step of 2/);
  });
});

describe('quadratureStep and the step each pair of draws gets', () => {
  it('reads the narrowest feature off the distributions (featureScale)', () => {
    expect(gumbelDelay(0, 9).featureScale!()).toBe(9);
    expect(mixtureDistribution([gumbelDelay(0, 9), gumbelDelay(30, 40)], [0.9, 0.1]).featureScale!()).toBe(9);
    // A component with no scale of its own leaves the mixture without one (tables stay at 1 minute).
    const g = gumbelDelay(0, 4);
    const plain = { cdf: (x: number) => g.cdf(x), survival: (x: number) => g.survival(x), pdf: (x: number) => g.pdf(x), sample: g.sample.bind(g), cdfGrid: g.cdfGrid!.bind(g), pdfGrid: g.pdfGrid!.bind(g) };
    expect(mixtureDistribution([gumbelDelay(0, 9), plain], [0.5, 0.5]).featureScale).toBeUndefined();
    // Typical scale e^2 = 7.4, disrupted e^3.5 = 33, severe Lomax lambda / (alpha + 1) = 60 / 4 = 15.
    const t = tailMixture([0, 2, 20, 3.5, -1, Math.log(60), Math.log(3), -1], 0);
    expect(t.featureScale()).toBeCloseTo(Math.exp(2), 12);
    expect(tailMixture([0, 3.5, 20, 3.5, -1, Math.log(60), Math.log(3), -1], 0).featureScale()).toBeCloseTo(15, 12);
  });

  it('widens with the narrowest feature, and stops at 2 where a density jumps', () => {
    expect([quadratureStep(4.9, false), quadratureStep(5, false), quadratureStep(9.9, false), quadratureStep(10, false), quadratureStep(30, false)]).toEqual([1, 2, 2, 4, 4]);
    expect([quadratureStep(30, true), quadratureStep(5, true), quadratureStep(4, true)]).toEqual([2, 2, 1]);
    expect(quadratureStep(Number.NaN, false)).toBe(1);
  });

  it('takes the narrower of the two draws, per draw', () => {
    const arrival = new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', [{ mu: 0, beta: 12 }, { mu: 0, beta: 6 }, { mu: 0, beta: 20 }]), 3);
    const departure = new RouteTables(gumbelRoute('DEN', 'SFO', 'departure', [{ mu: 0, beta: 12 }, { mu: 0, beta: 12 }, { mu: 0, beta: 4 }]), 3);
    const pair = new ConnectionPair(arrival, departure);
    expect([0, 1, 2].map((t) => pair.departureTable(t).step)).toEqual([4, 2, 1]);
  });

  it('falls back to a finer table where a coarse one needs exact cell masses (an undeclared jump)', () => {
    // A component from 5.6 minutes whose jump the distribution does not declare.
    const start = 5.6;
    const g = gumbelDelay(2, 11);
    const cdf = (x: number) => 0.9 * g.cdf(x) + (x <= start ? 0 : 0.1 * (1 - Math.exp(-(x - start) / 40)));
    const dist: DelayDistribution = {
      cdf,
      survival: (x) => 1 - cdf(x),
      pdf: (x) => 0.9 * g.pdf(x) + (x <= start ? 0 : (0.1 / 40) * Math.exp(-(x - start) / 40)),
      sample: () => 0,
    };
    expect(new DrawTable(dist, 'density', undefined, 4).cellMasses).toBe(true);
    const posterior: RoutePosterior = { origin: 'DEN', destination: 'SFO', kind: 'departure', pooling: 'route', flights: 1, derived: false, drawCount: 1, draw: () => dist };
    const table = new RouteTables(posterior, 1).table(0, 4);
    expect(table.step).toBeLessThan(4);
    // Exact cell masses at one minute are what a step-1 table would use too.
    if (table.step === 1) expect(table.cellMasses).toBe(true);
    else expect(table.cellMasses).toBe(false);
  });
});
