import t from '@stdlib/stats-base-dists-t';
import { describe, expect, it } from 'vitest';
import { createRng } from '../../../../shared/inference/rng';
import {
  digamma,
  gammaSample,
  logGamma,
  regularizedBeta,
  studentTCdf,
  studentTLogPdf,
  studentTSample,
  studentTSurvival,
} from '../../../../shared/delay/models/student-t';

function close(actual: number, expected: number, rel: number, what: string): void {
  const err = Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300);
  if (!(err <= rel)) throw new Error(`${what}: expected ${expected}, got ${actual}, relative error ${err} > ${rel}`);
}

describe('special functions', () => {
  it('logGamma matches log((n-1)!) and log sqrt(pi) (closed forms)', () => {
    expect(logGamma(1)).toBeCloseTo(0, 14);
    close(logGamma(5), Math.log(24), 1e-13, 'logGamma(5)');
    close(logGamma(0.5), 0.5 * Math.log(Math.PI), 1e-13, 'logGamma(0.5)');
    close(logGamma(101), [...Array(100).keys()].reduce((a, i) => a + Math.log(i + 1), 0), 1e-13, 'logGamma(101)');
    expect(logGamma(0)).toBeNaN();
    expect(logGamma(NaN)).toBeNaN();
  });

  it('digamma gives -gamma at 1 and obeys psi(x + 1) = psi(x) + 1/x (Abramowitz & Stegun 6.3.2, 6.3.5)', () => {
    close(digamma(1), -0.5772156649015329, 1e-13, 'digamma(1)');
    for (const x of [0.3, 1.7, 4.2, 12.5]) close(digamma(x + 1), digamma(x) + 1 / x, 1e-12, `recurrence at ${x}`);
    expect(digamma(-1)).toBeNaN();
  });

  it('regularizedBeta is symmetric, I_x(a,b) = 1 - I_(1-x)(b,a), and I_x(1,1) = x', () => {
    close(regularizedBeta(0.3, 1, 1), 0.3, 1e-13, 'I_0.3(1,1)');
    close(regularizedBeta(0.2, 2.5, 0.5), 1 - regularizedBeta(0.8, 0.5, 2.5), 1e-12, 'symmetry');
    expect(regularizedBeta(1.2, 1, 1)).toBeNaN();
  });
});

describe('Student-t against @stdlib/stats-base-dists-t', () => {
  const cases = [
    { x: 0.5, m: 0, s: 1, df: 1 },
    { x: 60, m: 25, s: 20, df: 2.7 },
    { x: 400, m: 25, s: 20, df: 2.7 },
    { x: -80, m: 25, s: 30, df: 3.5 },
    { x: 3, m: 1, s: 0.5, df: 30 },
  ];
  it.each(cases)('log density, CDF and survival at %o', ({ x, m, s, df }) => {
    const u = (x - m) / s;
    close(studentTLogPdf(x, m, s, df), t.logpdf(u, df) - Math.log(s), 1e-12, 'logpdf');
    close(studentTCdf(x, m, s, df), t.cdf(u, df), 1e-10, 'cdf');
    close(studentTSurvival(x, m, s, df), 1 - t.cdf(u, df), u > 5 ? 1e-6 : 1e-10, 'survival');
  });

  it('keeps the far right tail accurate where 1 - cdf cancels (Cauchy closed form: atan)', () => {
    const x = 1e7;
    close(studentTSurvival(x, 0, 1, 1), Math.atan(1 / x) / Math.PI, 1e-9, 'Cauchy tail');
  });

  it('follows the edge-case contract', () => {
    expect(studentTCdf(NaN, 0, 1, 3)).toBeNaN();
    expect(studentTCdf(1, 0, -1, 3)).toBeNaN();
    expect(studentTSurvival(1, 0, 1, 0)).toBeNaN();
    expect(studentTCdf(Infinity, 0, 1, 3)).toBe(1);
    expect(studentTSurvival(-Infinity, 0, 1, 3)).toBe(1);
    expect(studentTLogPdf(Infinity, 0, 1, 3)).toBe(-Infinity);
  });
});

describe('sampling', () => {
  it('Gamma(shape) draws have mean shape and variance shape (seeded)', () => {
    const rng = createRng(7);
    for (const shape of [0.6, 2.5]) {
      const n = 40_000;
      let s = 0;
      let s2 = 0;
      for (let i = 0; i < n; i++) {
        const g = gammaSample(rng, shape);
        s += g;
        s2 += g * g;
      }
      const mean = s / n;
      close(mean, shape, 0.03, `gamma mean, shape ${shape}`);
      close(s2 / n - mean * mean, shape, 0.06, `gamma variance, shape ${shape}`);
    }
  });

  it('t draws match the CDF at its quartiles (seeded)', () => {
    const rng = createRng(11);
    const n = 40_000;
    const q = [t.quantile(0.25, 3) * 20 + 25, t.quantile(0.75, 3) * 20 + 25];
    let below = [0, 0];
    for (let i = 0; i < n; i++) {
      const x = studentTSample(rng, 25, 20, 3);
      below = below.map((b, j) => b + (x <= q[j]! ? 1 : 0));
    }
    expect(Math.abs(below[0]! / n - 0.25)).toBeLessThan(0.01);
    expect(Math.abs(below[1]! / n - 0.75)).toBeLessThan(0.01);
  });
});
