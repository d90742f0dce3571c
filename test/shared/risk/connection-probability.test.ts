import logistic from '@stdlib/stats-base-dists-logistic';
import { describe, expect, it } from 'vitest';
import {
  centralInterval,
  ConnectionPair,
  drawMakeProbability,
  drawMakeProbabilityPair,
  makeCurvePoints,
  minimumLayover,
  pMakeAtLayover,
  pMakeIntervalAtLayover,
} from '../../../shared/risk/connection-probability';
import { sortedQuantile } from './quantile-reference';
import { DrawTable, RouteTables } from '../../../shared/risk/delay-table';
import { TailMixtureDistribution } from '../../../shared/delay/bundle/mixture-distribution';
import { FAMILY_PARAMETERS } from '../../../shared/delay/models/tail-mixture';
import { gumbelDelay, gumbelRoute } from '../../fixtures/risk/synthetic-source';
import { createRng, type Rng } from '../../../shared/inference/rng';

function closeTo(actual: number, expected: number, tol: number, what: string): void {
  if (!(Math.abs(actual - expected) <= tol)) {
    throw new Error(`${what}: expected ${expected}, got ${actual}, |diff| ${Math.abs(actual - expected)} > tol ${tol}`);
  }
}

// Draws with equal scale beta on both sides, and locations that vary across draws.
function equalScalePair(muA: number, muD: number, beta: number, draws: number, seed = 3) {
  const rng = createRng(seed);
  const a: { mu: number; beta: number }[] = [];
  const d: { mu: number; beta: number }[] = [];
  for (let s = 0; s < draws; s++) {
    a.push({ mu: muA + 3 * rng.normal(), beta });
    d.push({ mu: muD + 1.5 * rng.normal(), beta });
  }
  const pair = new ConnectionPair(new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', a), draws), new RouteTables(gumbelRoute('DEN', 'SFO', 'departure', d), draws));
  return { pair, a, d };
}

describe('drawMakeProbability', () => {
  // Reference: A, D ~ Gumbel with equal scale beta => A - D ~ Logistic(muA - muD, beta), a standard
  // result on differences of Gumbel variables; CDF from @stdlib/stats-base-dists-logistic.
  it.each([
    { muA: 5, muD: 2, beta: 12 },
    { muA: 20, muD: 0, beta: 25 },
    { muA: -3, muD: 8, beta: 6 },
    { muA: 0, muD: 0, beta: 40 },
  ])('matches the logistic closed form for Gumbel(%o) inbound and outbound (@stdlib/stats-base-dists-logistic)', ({ muA, muD, beta }) => {
    const arr = new DrawTable(gumbelDelay(muA, beta), 'cdf');
    const dep = new DrawTable(gumbelDelay(muD, beta), 'density');
    for (const m of [-60, -20, -5, 0, 3, 15, 30, 60, 120, 300]) {
      const expected = logistic.cdf(m, muA - muD, beta);
      closeTo(drawMakeProbability(arr, dep, m), expected, 2e-5, `m=${m}, muA=${muA}, muD=${muD}, beta=${beta}`);
    }
  });
});

describe('distributions that evaluate runs of minutes at once', () => {
  // A Gumbel whose cdfGrid and pdfGrid step e^{-z} by the ratio e^{-step/beta}.
  function steppedGumbel(mu: number, beta: number, calls: { n: number }) {
    const g = gumbelDelay(mu, beta);
    const run = (lo: number, out: Float64Array, density: boolean, step = 1) => {
      calls.n++;
      const q = Math.exp(-step / beta);
      let t = Math.exp(-(lo - mu) / beta);
      for (let i = 0; i < out.length; i++, t *= q) out[i] = density ? (t * Math.exp(-t)) / beta : Math.exp(-t);
    };
    return {
      cdf: (x: number) => g.cdf(x),
      survival: (x: number) => g.survival(x),
      pdf: (x: number) => g.pdf(x),
      sample: (rng: Rng) => g.sample(rng),
      cdfGrid: (lo: number, out: Float64Array, step?: number) => run(lo, out, false, step),
      pdfGrid: (lo: number, out: Float64Array, step?: number) => run(lo, out, true, step),
    };
  }

  it('give the same tables and P(make) as point-by-point calls, and the logistic closed form (@stdlib/stats-base-dists-logistic)', () => {
    const calls = { n: 0 };
    const arr = new DrawTable(steppedGumbel(5, 12, calls), 'cdf');
    const dep = new DrawTable(steppedGumbel(2, 12, calls), 'density');
    expect(calls.n).toBe(2);
    const plainArr = new DrawTable(gumbelDelay(5, 12), 'cdf');
    const plainDep = new DrawTable(gumbelDelay(2, 12), 'density');
    expect(arr.cdf.length).toBe(plainArr.cdf.length);
    arr.cdf.forEach((v, i) => closeTo(v, plainArr.cdf[i]!, 1e-13, `F at minute ${arr.lo + i}`));
    dep.weight.forEach((v, i) => closeTo(v, plainDep.weight[i]!, 1e-13, `weight at minute ${dep.lo + i}`));
    for (const m of [-20, 0, 15, 60]) {
      closeTo(drawMakeProbability(arr, dep, m), drawMakeProbability(plainArr, plainDep, m), 1e-12, `m=${m}`);
      closeTo(drawMakeProbability(arr, dep, m), logistic.cdf(m, 3, 12), 2e-5, `closed form, m=${m}`);
    }
  });

  it('build the same tables, to 1e-13, whether the tail nodes come from survivalAt or from survival calls', () => {
    for (const family of ['gumbel-gumbel', 'gumbel-gumbel-lomax'] as const) {
      const eta = family === 'gumbel-gumbel' ? [-2, Math.log(11), 35, Math.log(50), -2] : [-2, Math.log(11), 35, Math.log(50), -2, Math.log(300), Math.log(2.2), -0.5];
      const dist = new TailMixtureDistribution(family, eta, 4, 6.1);
      // The same distribution without the batch: every method but survivalAt, bound to it.
      const pointwise = { cdf: (x: number) => dist.cdf(x), survival: (x: number) => dist.survival(x), pdf: (x: number) => dist.pdf(x), sample: dist.sample.bind(dist), cdfGrid: dist.cdfGrid.bind(dist), pdfGrid: dist.pdfGrid.bind(dist), densityJumps: dist.densityJumps.bind(dist) };
      for (const role of ['cdf', 'density'] as const) {
        const batched = new DrawTable(dist, role);
        const plain = new DrawTable(pointwise, role);
        // survivalAt is within 1e-13 of survival, relative (a Gumbel steps its terms from node to node).
        const near = (a: ArrayLike<number>, b: ArrayLike<number>, what: string) => {
          expect(a.length, what).toBe(b.length);
          for (let i = 0; i < a.length; i++) closeTo(a[i]!, b[i]!, 1e-13, `${family} ${role} ${what}[${i}]`);
        };
        expect(batched.tailIndex.length, `${family} ${role}`).toBe(plain.tailIndex.length);
        expect([batched.lo, batched.hi, batched.coreLength]).toEqual([plain.lo, plain.hi, plain.coreLength]);
        near(batched.cdf, plain.cdf, 'cdf');
        near(batched.far, plain.far, 'far');
        near(batched.weight, plain.weight, 'weight');
        near(batched.tailWeight, plain.tailWeight, 'tailWeight');
        expect(Math.abs(batched.highMass - plain.highMass)).toBeLessThanOrEqual(1e-13 * plain.highMass);
      }
    }
  });
});

describe('ConnectionPair', () => {
  it('averages the closed form over posterior draws (@stdlib/stats-base-dists-logistic)', () => {
    const { pair, a, d } = equalScalePair(8, 3, 15, 40);
    for (const layover of [40, 55, 75, 120]) {
      const m = layover - 45;
      let expected = 0;
      for (let s = 0; s < 40; s++) expected += logistic.cdf(m, a[s]!.mu - d[s]!.mu, 15) / 40;
      closeTo(pMakeAtLayover(pair, layover, 45), expected, 2e-5, `layover ${layover}`);
    }
  });
});

// A heavier-tailed posterior, like a typical-plus-disrupted mixture, built from committed Gumbel pieces.
function mixtureTables(kind: 'arrival' | 'departure', seed: number) {
  const rng = createRng(seed);
  const draws = Array.from({ length: 30 }, () => ({ mu: 2 + 2 * rng.normal(), beta: 11 * Math.exp(0.1 * rng.normal()), wide: 50 + 10 * rng.uniform(), w: 0.05 + 0.1 * rng.uniform() }));
  const route = {
    origin: 'FRA',
    destination: 'LHR',
    kind,
    pooling: 'route' as const,
    flights: 10,
    derived: false,
    drawCount: draws.length,
    draw: (s: number) => {
      const p = draws[s]!;
      const a = gumbelDelay(p.mu, p.beta);
      const b = gumbelDelay(30, p.wide);
      return {
        cdf: (x: number) => (1 - p.w) * a.cdf(x) + p.w * b.cdf(x),
        survival: (x: number) => (1 - p.w) * a.survival(x) + p.w * b.survival(x),
        pdf: (x: number) => (1 - p.w) * a.pdf(x) + p.w * b.pdf(x),
        sample: (r: ReturnType<typeof createRng>) => (r.uniform() < p.w ? b.sample(r) : a.sample(r)),
      };
    },
  };
  return new RouteTables(route, draws.length);
}

describe('monotonicity and the minimum layover', () => {
  const pairs = {
    gumbel: equalScalePair(8, 3, 15, 40).pair,
    'heavy-tailed mixture': new ConnectionPair(mixtureTables('arrival', 11), mixtureTables('departure', 12)),
  };

  it.each(Object.entries(pairs))('never lowers P(make) when the layover grows (%s)', (_name, pair) => {
    let previous = -1;
    for (let layover = 0; layover <= 900; layover++) {
      const p = pMakeAtLayover(pair, layover, 45);
      expect(p).toBeGreaterThanOrEqual(previous);
      expect(p).toBeLessThanOrEqual(1);
      previous = p;
    }
  });

  it.each(Object.entries(pairs))('gives P >= target at the minimum layover and P < target one minute less (%s)', (_name, pair) => {
    for (const target of [0.5, 0.8, 0.9, 0.95, 0.99]) {
      for (const mct of [30, 45, 90]) {
        const min = minimumLayover(pair, mct, target);
        expect(min, `target ${target}, MCT ${mct}`).not.toBeNull();
        expect(pMakeAtLayover(pair, min!, mct)).toBeGreaterThanOrEqual(target);
        if (min! > 0) expect(pMakeAtLayover(pair, min! - 1, mct)).toBeLessThan(target);
      }
    }
  });

  // Reference: a plain scan upward from 0 minutes on the same P(make), minute by minute.
  it('agrees with a minute-by-minute scan, whatever the guesses', () => {
    const rng = createRng(29);
    const spread = (kind: 'arrival' | 'departure', mu: number, beta: number, sd: number) =>
      new RouteTables(gumbelRoute('ORD', 'DEN', kind, Array.from({ length: 24 }, () => ({ mu: mu + sd * rng.normal(), beta: beta * Math.exp(0.5 * rng.normal()) }))), 24);
    const cases = [
      new ConnectionPair(spread('arrival', 10, 12, 5), spread('departure', 0, 10, 3)),
      // Draws that disagree wildly, so the guiding subset of draws is a poor guide.
      new ConnectionPair(spread('arrival', 30, 4, 60), spread('departure', 0, 30, 40)),
      pairs['heavy-tailed mixture'],
    ];
    for (const pair of cases) {
      for (const target of [0.3, 0.9, 0.97]) {
        let scan: number | null = null;
        for (let layover = 0; layover <= 1440; layover++) {
          if (pMakeAtLayover(pair, layover, 45) >= target) {
            scan = layover;
            break;
          }
        }
        expect(minimumLayover(pair, 45, target), `target ${target}`).toBe(scan);
      }
    }
  });

  it('gives the same answer whether P(make) is already known at other margins (aiming its guides) or not', () => {
    const fresh = () => [
      equalScalePair(8, 3, 15, 40).pair,
      new ConnectionPair(mixtureTables('arrival', 11), mixtureTables('departure', 12)),
      new ConnectionPair(mixtureTables('arrival', 5), mixtureTables('departure', 6)),
    ];
    const plain = fresh();
    const primed = fresh();
    // Known margins near and far from the answers, as scoring leaves them.
    for (const pair of primed) pair.prepare([-60, -5, 0, 17, 40, 41, 300]);
    for (const target of [0.5, 0.9, 0.99]) {
      for (const mct of [30, 60]) {
        plain.forEach((pair, k) => expect(minimumLayover(primed[k]!, mct, target), `pair ${k}, target ${target}`).toBe(minimumLayover(pair, mct, target)));
      }
    }
  });

  it('returns 0 when even no layover reaches the target, and null when no layover up to a day does', () => {
    const early = new ConnectionPair(
      new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', [{ mu: -200, beta: 5 }]), 1),
      new RouteTables(gumbelRoute('DEN', 'SFO', 'departure', [{ mu: 0, beta: 5 }]), 1),
    );
    expect(minimumLayover(early, 45, 0.9)).toBe(0);
    const hopeless = new ConnectionPair(
      new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', [{ mu: 3000, beta: 5 }]), 1),
      new RouteTables(gumbelRoute('DEN', 'SFO', 'departure', [{ mu: 0, beta: 5 }]), 1),
    );
    expect(minimumLayover(hopeless, 45, 0.9)).toBeNull();
  });

  it('rejects a target outside (0, 1)', () => {
    expect(() => minimumLayover(pairs.gumbel, 45, 1)).toThrow(RangeError);
    expect(() => minimumLayover(pairs.gumbel, 45, Number.NaN)).toThrow(RangeError);
  });
});

describe('two margins in one pass', () => {
  const pairs = [
    equalScalePair(8, 3, 15, 8).pair,
    new ConnectionPair(mixtureTables('arrival', 21), mixtureTables('departure', 22)),
    new ConnectionPair(new RouteTables(lomaxMixture('arrival').posterior, 1), new RouteTables(lomaxMixture('departure').posterior, 1)),
  ];

  it('gives exactly drawMakeProbability at each margin, whether their terms overlap or not', () => {
    // Neighbours, apart, equal, reversed, far below and far above the grids, and one margin
    // whose terms share no run of A's whole-minute table with the other's.
    const margins: [number, number][] = [[30, 31], [0, 45], [45, 0], [7, 7], [-3000, 3000], [-200, 5], [500, 501], [1400, -1400], [-40, 900]];
    for (const pair of pairs) {
      const out0 = new Float64Array(pair.draws);
      const out1 = new Float64Array(pair.draws);
      for (const [m0, m1] of margins) {
        for (let t = 0; t < pair.draws; t++) {
          const a = pair.arrival.table(t);
          const d = pair.departure.table(t);
          drawMakeProbabilityPair(a, d, m0, m1, out0, out1, t);
          expect(out0[t], `draw ${t}, margin ${m0}`).toBe(drawMakeProbability(a, d, m0));
          expect(out1[t], `draw ${t}, margin ${m1}`).toBe(drawMakeProbability(a, d, m1));
        }
      }
    }
  });

  it('lets ConnectionPair.prepare work out the same draws as drawProbabilities one margin at a time', () => {
    const margins = [12, -3, 40, 41, 12, 700, 5];
    const fresh = () => new ConnectionPair(mixtureTables('arrival', 31), mixtureTables('departure', 32));
    const prepared = fresh();
    prepared.prepare(margins);
    for (const m of margins) expect(prepared.has(m)).toBe(true);
    expect(prepared.has(13)).toBe(false);
    const oneByOne = fresh();
    for (const m of margins) expect(Array.from(prepared.drawProbabilities(m))).toEqual(Array.from(oneByOne.drawProbabilities(m)));
    expect(() => prepared.prepare([3, 4.5])).toThrow(RangeError);
    prepared.prepare([NaN]);
    expect(prepared.has(NaN)).toBe(false);
  });
});

describe('credible intervals', () => {
  it('widen with parameter uncertainty and hold the predictive mean', () => {
    const { pair } = equalScalePair(8, 3, 15, 40);
    const [lo, hi] = pMakeIntervalAtLayover(pair, 70, 45, 0.9);
    const p = pMakeAtLayover(pair, 70, 45);
    expect(lo).toBeLessThan(p);
    expect(hi).toBeGreaterThan(p);
    const certain = new ConnectionPair(
      new RouteTables(gumbelRoute('ORD', 'DEN', 'arrival', Array.from({ length: 20 }, () => ({ mu: 8, beta: 15 }))), 20),
      new RouteTables(gumbelRoute('DEN', 'SFO', 'departure', Array.from({ length: 20 }, () => ({ mu: 3, beta: 15 }))), 20),
    );
    const [clo, chi] = pMakeIntervalAtLayover(certain, 70, 45, 0.9);
    expect(chi - clo).toBeLessThan(1e-12);
    expect(hi - lo).toBeGreaterThan(0.02);
  });

  // Hyndman & Fan (1996) definition 7 is R's quantile(type = 7) default; values from its formula.
  it('uses quantile definition 7 (as R type 7)', () => {
    expect(sortedQuantile([1, 2, 3, 4, 5], 0.05)).toBeCloseTo(1.2, 12);
    expect(sortedQuantile([1, 2, 3, 4, 5], 0.95)).toBeCloseTo(4.8, 12);
    expect(centralInterval([5, 1, 4, 2, 3], 0.5)).toEqual([2, 4]);
    expect(centralInterval([1, Number.NaN], 0.5)).toEqual([Number.NaN, Number.NaN]);
    expect(() => centralInterval([1], 1)).toThrow(RangeError);
  });
});

describe('makeCurvePoints', () => {
  it('charts P(make) with a band that contains it', () => {
    const { pair } = equalScalePair(8, 3, 15, 40);
    const points = makeCurvePoints(pair, { mctMinutes: 45, intervalLevel: 0.9, fromMinutes: 30, toMinutes: 120, stepMinutes: 5 });
    expect(points).toHaveLength(19);
    for (const p of points) {
      expect(p.lo).toBeLessThanOrEqual(p.pMake);
      expect(p.hi).toBeGreaterThanOrEqual(p.pMake);
      expect(p.pMake).toBe(pMakeAtLayover(pair, p.layoverMinutes, 45));
    }
  });

  it('rejects a fractional margin', () => {
    const { pair } = equalScalePair(8, 3, 15, 4);
    expect(() => pair.drawProbabilities(1.5)).toThrow(RangeError);
    expect(Number.isNaN(pair.probability(Number.NaN))).toBe(true);
  });
});

describe('quadrature accuracy on a heavy-tailed mixture', () => {
  // Reference: a direct trapezoid sum with step 0.05 minutes over [-200, 3000] on the
  // distribution functions themselves (no tables): an independent evaluation of the same integral.
  it('agrees with a fine direct integration within 2e-5', () => {
    const arrival = mixtureTables('arrival', 21);
    const departure = mixtureTables('departure', 22);
    for (const t of [0, 7, 19]) {
      const a = arrival.table(t);
      const d = departure.table(t);
      for (const m of [-30, 0, 20, 60, 150]) {
        let reference = 0;
        for (let x = -200; x <= 3000; x += 0.05) reference += d.dist.pdf(x) * a.dist.cdf(m + x) * 0.05;
        closeTo(drawMakeProbability(a, d, m), reference, 2e-5, `draw ${t}, m=${m}`);
      }
    }
  });
});

describe('drawMakeProbability against its own rule, term by term', () => {
  // The documented sum, E[F_A(m + D)] ~ lowMass F_A(m + lo) + sum_i w_i F_A(m + lo + i)
  // + sum_k tw_k F_A(m + lo + tail_k) + highMass F_A(m + hi), with every F_A from the table's
  // public cdfAt: the quadrature's fast loops (which write the far tail's interpolation out)
  // must give the same number for every margin, whichever part of A's table each term meets.
  it('matches the sum over cdfAt at margins that reach A\'s far points and beyond', () => {
    for (const t of [0, 11]) {
      const a = mixtureTables('arrival', 21).table(t);
      const d = mixtureTables('departure', 22).table(t);
      expect(a.far.length).toBeGreaterThan(2);
      expect(d.tailIndex.length).toBeGreaterThan(2);
      let farTerms = 0;
      for (const m of [-400, -60, 0, 45, 130, 250, 333, 480, 700, 1000, 3000]) {
        let sum = d.lowMass * a.cdfAt(m + d.lo);
        for (let i = 0; i < d.coreLength; i++) sum += d.weight[i]! * a.cdfAt(m + d.lo + i);
        d.tailIndex.forEach((offset, k) => {
          const x = m + d.lo + offset;
          if (x > a.top && x < a.hi) farTerms++;
          sum += d.tailWeight[k]! * a.cdfAt(x);
        });
        sum += d.highMass * a.cdfAt(m + d.hi);
        closeTo(drawMakeProbability(a, d, m), Math.min(1, sum), 1e-14, `draw ${t}, m=${m}`);
      }
      // Some tail nodes did land between A's far points.
      expect(farTerms).toBeGreaterThan(5);
    }
  });
});

describe('quadrature accuracy far into the tail', () => {
  // The same reference as above, with the step widened to 0.5 minutes past 600 minutes and the
  // remainder beyond 40,000 minutes counted at its lower bound S_D(40000) F_A(m + 40000).
  function reference(a: DrawTable, d: DrawTable, m: number): number {
    let r = 0;
    for (let x = -300; x < 600; x += 0.05) r += d.dist.pdf(x + 0.025) * a.dist.cdf(m + x + 0.025) * 0.05;
    for (let x = 600; x < 40000; x += 0.5) r += d.dist.pdf(x + 0.25) * a.dist.cdf(m + x + 0.25) * 0.5;
    return r + d.dist.survival(40000) * a.dist.cdf(m + 40000);
  }

  it('stays within 1e-6 of a fine direct integration at long margins (light tail)', () => {
    const a = mixtureTables('arrival', 21).table(0);
    const d = mixtureTables('departure', 22).table(0);
    for (const m of [400, 600, 900]) closeTo(drawMakeProbability(a, d, m), reference(a, d, m), 1e-6, `m=${m}`);
  });

  // A Gumbel plus a log-logistic component (shape 3, from -60 minutes): smooth, with S ~ x^-3,
  // too heavy for the grid to reach S = 1e-7 within two days.
  function heavyTables(kind: 'arrival' | 'departure', mu: number, w: number): DrawTable {
    const g = gumbelDelay(mu, 11);
    const y = (x: number) => Math.max(0, (x + 60) / 80);
    const s = (x: number) => 1 / (1 + y(x) ** 3);
    const dist = {
      cdf: (x: number) => (1 - w) * g.cdf(x) + w * (1 - s(x)),
      survival: (x: number) => (1 - w) * g.survival(x) + w * s(x),
      pdf: (x: number) => (1 - w) * g.pdf(x) + w * ((3 / 80) * y(x) ** 2) / (1 + y(x) ** 3) ** 2,
      sample: (r: ReturnType<typeof createRng>) => g.sample(r),
    };
    return new DrawTable(dist, kind === 'arrival' ? 'cdf' : 'density');
  }

  it('stays within 2e-5 of a fine direct integration for a smooth heavy tail', () => {
    const a = heavyTables('arrival', 2, 0.1);
    const d = heavyTables('departure', -1, 0.12);
    expect(a.heavyTail).toBe(true);
    for (const m of [0, 150, 400, 900, 1400]) closeTo(drawMakeProbability(a, d, m), reference(a, d, m), 2e-5, `m=${m}`);
  });
});

// A Gumbel plus a Lomax (Pareto II) component with tail index 0.9: a tail so heavy that the mean
// does not exist and the grid is cut long before the survival function becomes negligible.
function lomaxMixture(kind: 'arrival' | 'departure') {
  const g = gumbelDelay(2, 11);
  const w = 0.08;
  const alpha = 0.9;
  const sigma = 40;
  const lomaxS = (x: number) => (x <= 0 ? 1 : Math.pow(1 + x / sigma, -alpha));
  const dist = {
    cdf: (x: number) => (1 - w) * g.cdf(x) + w * (1 - lomaxS(x)),
    survival: (x: number) => (1 - w) * g.survival(x) + w * lomaxS(x),
    pdf: (x: number) => (1 - w) * g.pdf(x) + w * (x <= 0 ? 0 : (alpha / sigma) * Math.pow(1 + x / sigma, -alpha - 1)),
    sample: (r: ReturnType<typeof createRng>) => g.sample(r),
  };
  return new RouteTables({ origin: 'ORD', destination: 'DEN', kind, pooling: 'route', flights: 1, derived: false, drawCount: 1, draw: () => dist }, 1);
}

describe('a tail too heavy for the grid', () => {
  it('keeps P(make) monotone, the minimum layover exact, and samples finite', () => {
    const arrival = lomaxMixture('arrival');
    const pair = new ConnectionPair(arrival, lomaxMixture('departure'));
    expect(arrival.table(0).heavyTail).toBe(true);
    let previous = -1;
    for (let layover = 0; layover <= 1440; layover += 3) {
      const p = pMakeAtLayover(pair, layover, 45);
      expect(p).toBeGreaterThanOrEqual(previous);
      previous = p;
    }
    const min = minimumLayover(pair, 45, 0.95);
    expect(min).not.toBeNull();
    expect(pMakeAtLayover(pair, min!, 45)).toBeGreaterThanOrEqual(0.95);
    expect(pMakeAtLayover(pair, min! - 1, 45)).toBeLessThan(0.95);
    expect(minimumLayover(pair, 45, 0.999)).toBeNull();
    const table = arrival.table(0);
    for (const u of [1e-12, 0.5, 0.99, 1 - 1e-9]) expect(Number.isFinite(table.inverse(u))).toBe(true);
  });
});

describe('departure densities the trapezoid cannot integrate', () => {
  // Reference: the same integral from the distribution's own CDF in cells of 0.01 minutes,
  // P = sum (F_D(x + h) - F_D(x)) F_A(m + x + h/2), with the mass beyond 3000 minutes at F_A(m + 3000):
  // an independent evaluation that needs no density at all.
  function cellReference(a: DrawTable, d: DrawTable, m: number): number {
    const h = 0.01;
    let r = d.dist.cdf(-300) * a.dist.cdf(m - 300);
    let previous = d.dist.cdf(-300);
    for (let x = -300; x < 3000; x += h) {
      const next = d.dist.cdf(x + h);
      r += (next - previous) * a.dist.cdf(m + x + h / 2);
      previous = next;
    }
    return r + d.dist.survival(3000) * a.dist.cdf(m + 3000);
  }

  function mixture(parts: { w: number; cdf: (x: number) => number; pdf: (x: number) => number }[]) {
    const cdf = (x: number) => parts.reduce((s, p) => s + p.w * p.cdf(x), 0);
    return { cdf, survival: (x: number) => 1 - cdf(x), pdf: (x: number) => parts.reduce((s, p) => s + p.w * p.pdf(x), 0), sample: () => 0 };
  }
  const gumbelPart = (w: number, mu: number, beta: number) => {
    const g = gumbelDelay(mu, beta);
    return { w, cdf: (x: number) => g.cdf(x), pdf: (x: number) => g.pdf(x) };
  };

  it('integrates a component that starts between two minutes (a density jump) to within 1e-4 (the trapezoid was off by 1.2e-4)', () => {
    // A severe Lomax part from 5.6 minutes, as a derived departure's shifted start puts it.
    const start = 5.6;
    const lomax = { w: 0.06, cdf: (x: number) => (x <= start ? 0 : 1 - Math.pow(1 + (x - start) / 30, -1.5)), pdf: (x: number) => (x <= start ? 0 : (1.5 / 30) * Math.pow(1 + (x - start) / 30, -2.5)) };
    const d = new DrawTable(mixture([gumbelPart(0.94, 2, 11), lomax]), 'density');
    const a = new DrawTable(gumbelDelay(5, 12), 'cdf');
    for (const m of [-20, 0, 15, 45, 120]) closeTo(drawMakeProbability(a, d, m), cellReference(a, d, m), 1e-4, `m=${m}`);
  });

  it('corrects the trapezoid for a jump the distribution declares (densityJumps: jump and slope) to within 1e-6, without exact cell masses', () => {
    const start = 5.6;
    const lomax = { w: 0.06, cdf: (x: number) => (x <= start ? 0 : 1 - Math.pow(1 + (x - start) / 30, -1.5)), pdf: (x: number) => (x <= start ? 0 : (1.5 / 30) * Math.pow(1 + (x - start) / 30, -2.5)) };
    const plain = mixture([gumbelPart(0.94, 2, 11), lomax]);
    const jump = (0.06 * 1.5) / 30;
    const declared = { ...plain, densityJumps: () => [[start, jump, (-2.5 * jump) / 30] as const] };
    const d = new DrawTable(declared, 'density');
    const a = new DrawTable(gumbelDelay(5, 12), 'cdf');
    // Away from the jump and the core's end the weights are still the density itself (trapezoid).
    for (const x of [-10, 0, 20, 40]) closeTo(d.weight[x - d.lo]!, declared.pdf(x), 1e-15, `weight at ${x}`);
    for (const m of [-20, 0, 15, 45, 120]) closeTo(drawMakeProbability(a, d, m), cellReference(a, d, m), 1e-6, `m=${m}`);
  });

  it('builds the same exact-cell table from a distribution that evaluates half-minute grids as from point calls', () => {
    // A typical scale of 0.03 minutes (a population draw): the core falls back to exact cells.
    const eta = [2.4, Math.log(0.03), 30, Math.log(25), -1.5, Math.log(40), Math.log(1.2), -1];
    const gridded = new TailMixtureDistribution('gumbel-gumbel-lomax', eta, 4, 6.1);
    const pointwise = { cdf: (x: number) => gridded.cdf(x), survival: (x: number) => gridded.survival(x), pdf: (x: number) => gridded.pdf(x), sample: () => 0 };
    const a = new DrawTable(gridded, 'density');
    const b = new DrawTable(pointwise, 'density');
    expect(a.weight.length).toBe(b.weight.length);
    a.weight.forEach((w, i) => closeTo(w, b.weight[i]!, 1e-10, `weight at ${a.lo + i}`));
    a.cdf.forEach((v, i) => closeTo(v, b.cdf[i]!, 1e-10, `F at ${a.lo + i}`));
    // The typical part (weight 0.82) sits at 8.5 minutes: the exact cells split it between 8 and 9.
    expect(a.weight[8 - a.lo]! + a.weight[9 - a.lo]!).toBeGreaterThan(0.8);
  });

  it('integrates a spike narrower than a minute to within 1.5e-3 (counted at its minute, 5.8e-3 off)', () => {
    // Half the mass sits at 3.4 minutes. Counted at minute 3 the error is that mass times F_A's
    // change over 0.4 minutes, 5.8e-3 at m = 0; the cell's centre of mass from Simpson's rule on F
    // (3.33) splits it between minutes 3 and 4 and leaves about a fifth of that.
    const d = new DrawTable(mixture([gumbelPart(0.5, 3.4, 0.03), gumbelPart(0.5, 0, 9)]), 'density');
    const a = new DrawTable(gumbelDelay(5, 12), 'cdf');
    for (const m of [-20, 0, 15, 45, 120]) closeTo(drawMakeProbability(a, d, m), cellReference(a, d, m), 1.5e-3, `m=${m}`);
  });
});

describe('draws wider than the grid', () => {
  // Reference: CDF cells of 0.01 minutes over [-300, 3000] and of 1 minute from -100,000 to
  // 100,000 minutes outside it, each cell's mass at its midpoint (no tables).
  function wideReference(a: DrawTable, d: DrawTable, m: number): number {
    let r = d.dist.cdf(-100_000) * a.dist.cdf(m - 100_000);
    let x = -100_000;
    let previous = d.dist.cdf(x);
    while (x < 100_000) {
      const h = x >= -300 && x < 3000 ? 0.01 : 1;
      const next = d.dist.cdf(x + h);
      r += (next - previous) * a.dist.cdf(m + x + h / 2);
      previous = next;
      x += h;
    }
    return r + d.dist.survival(100_000) * a.dist.cdf(m + 100_000);
  }

  it('keeps the bulk of a departure draw spread over days on the grid, within 2e-3', () => {
    // A quarter of the mass in a Gumbel 12,000 minutes wide, as population draws for airports
    // absent from the data can be: the grid used to start days early and cut the bulk off.
    const wide = gumbelDelay(-15, 12_000);
    const typical = gumbelDelay(23, 16);
    const dist = {
      cdf: (x: number) => 0.25 * wide.cdf(x) + 0.75 * typical.cdf(x),
      survival: (x: number) => 0.25 * wide.survival(x) + 0.75 * typical.survival(x),
      pdf: (x: number) => 0.25 * wide.pdf(x) + 0.75 * typical.pdf(x),
      sample: () => 0,
    };
    const d = new DrawTable(dist, 'density');
    const a = new DrawTable(gumbelDelay(5, 12), 'cdf');
    expect(d.lo).toBeGreaterThan(-2000);
    for (const m of [0, 30, 90]) closeTo(drawMakeProbability(a, d, m), wideReference(a, d, m), 2e-3, `m=${m}`);
  });
});

describe('grid searches started from the draw before', () => {
  // A route's tables are built in draw order, each starting its three grid searches (first
  // minute with F > 1e-10, S <= 1e-7, S <= 1e-2) where the table before ended; a table built
  // with no such start halves its brackets from the search bounds. Both must land on the same
  // minutes, whatever the shapes: the predicates are monotone.
  function route(kind: 'arrival' | 'departure', draw: (s: number) => TailMixtureDistribution, drawCount: number) {
    return new RouteTables({ origin: 'BOS', destination: 'CDG', kind, pooling: 'population', flights: 0, derived: false, drawCount, draw }, drawCount);
  }
  const rng = createRng(23);
  // Population-like spreads: log scales from about 0 to 6 (1 to 400 minutes), tail weights
  // from a few percent to a half, Lomax indices from 0.3 to 30.
  const etas = Array.from({ length: 40 }, () => [30 * rng.normal(), 3 + 1.5 * rng.normal(), 40 * rng.normal(), 3 + 1.2 * rng.normal(), -1 + 1.5 * rng.normal(), 3 + 1.5 * rng.normal(), 1 + 1.2 * rng.normal(), rng.normal()]);
  it.each(['gumbel', 'gumbel-gumbel', 'gumbel-t', 'gumbel-lomax', 'gumbel-gumbel-lomax'] as const)('%s', (family) => {
    for (const kind of ['arrival', 'departure'] as const) {
      const draws = etas.map((eta) => new TailMixtureDistribution(family, eta.slice(0, FAMILY_PARAMETERS[family].length), 4, kind === 'departure' ? 6.1 : 0));
      const tables = route(kind, (s) => draws[s]!, draws.length);
      draws.forEach((dist, t) => {
        const hinted = tables.table(t);
        const fresh = new DrawTable(dist, kind === 'arrival' ? 'cdf' : 'density');
        expect(hinted.searched, `${family} ${kind} draw ${t}`).toEqual(fresh.searched);
        expect([hinted.lo, hinted.hi, hinted.coreLength]).toEqual([fresh.lo, fresh.hi, fresh.coreLength]);
        expect(Array.from(hinted.cdf)).toEqual(Array.from(fresh.cdf));
      });
    }
  });

  it('builds a departure table alone, at the step asked for, from the nearest draw built', () => {
    // A route's pairs ask for scattered draws at different steps: only those are built, and each
    // equals a table built with no hint at all.
    const draws = etas.map((eta) => new TailMixtureDistribution('gumbel-gumbel', eta.slice(0, 5), 4, 6.1));
    const asked: number[] = [];
    const tables = route('departure', (s) => (asked.push(s), draws[s]!), draws.length);
    const order: [number, number][] = [[30, 1], [5, 2], [31, 1], [6, 1], [29, 4], [5, 1]];
    for (const [t, step] of order) {
      const hinted = tables.table(t, step);
      // (A coarse table that needs exact cell masses is rebuilt finer, as RouteTables does.)
      let fresh = new DrawTable(draws[t]!, 'density', undefined, step);
      while (fresh.cellMasses && fresh.step > 1) fresh = new DrawTable(draws[t]!, 'density', undefined, fresh.step / 2);
      expect(hinted.step, `draw ${t}`).toBe(fresh.step);
      expect(hinted.searched, `draw ${t} step ${step}`).toEqual(fresh.searched);
      expect(Array.from(hinted.weight)).toEqual(Array.from(fresh.weight));
      expect(Array.from(hinted.tailWeight)).toEqual(Array.from(fresh.tailWeight));
    }
    expect(asked).toEqual(order.map(([t]) => t));
    // Asked again, nothing new is built.
    tables.table(30, 1);
    tables.table(5, 2);
    expect(asked.length).toBe(order.length);
  });
});
