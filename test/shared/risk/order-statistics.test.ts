import { describe, expect, it } from 'vitest';
import { centralInterval } from '../../../shared/risk/connection-probability';
import { sortedQuantile } from './quantile-reference';
import { selectInRange, selectQuantile } from '../../../shared/risk/order-statistics';
import { createRng } from '../../../shared/inference/rng';

// Reference: Hyndman & Fan (1996) definition 7 (R's quantile type 7) on a fully sorted copy;
// sortedQuantile is checked against R's values in connection-probability.test.ts.
describe('selectQuantile', () => {
  const rng = createRng(5);
  const cases: Record<string, number[]> = {
    'draw probabilities': Array.from({ length: 64 }, () => rng.uniform()),
    ties: Array.from({ length: 64 }, () => Math.floor(rng.uniform() * 3) / 2),
    'sorted descending': Array.from({ length: 50 }, (_, i) => 50 - i),
    'one value': [0.25],
    'two values': [0.9, 0.1],
  };
  it.each(Object.entries(cases))('matches definition 7 on a sorted copy (%s)', (_name, values) => {
    const sorted = Float64Array.from(values).sort();
    for (const p of [0, 0.05, 0.1, 0.5, 0.9, 0.95, 1]) {
      const work = Float64Array.from(values);
      expect(selectQuantile(work, work.length, p), `p=${p}`).toBe(sortedQuantile(sorted, p));
      // Only reordered: the same values remain.
      expect(Float64Array.from(work).sort()).toEqual(sorted);
    }
  });

  it('gives NaN for no values', () => {
    expect(selectQuantile(new Float64Array(4), 0, 0.5)).toBeNaN();
  });
});

describe('selectInRange', () => {
  it('selects within its range and leaves the rest alone', () => {
    const a = Float64Array.of(100, 7, 3, 9, 1, 5, -100);
    // a[1..6) sorted is 1, 3, 5, 7, 9 at indices 1 to 5: index 3 holds 5.
    expect(selectInRange(a, 1, 3, 6)).toBe(5);
    expect(a[0]).toBe(100);
    expect(a[6]).toBe(-100);
  });
});

describe('centralInterval by selection', () => {
  it('equals the interval from a sorted copy of many draws', () => {
    const rng = createRng(11);
    for (let rep = 0; rep < 50; rep++) {
      const n = 1 + Math.floor(rng.uniform() * 100);
      const values = Array.from({ length: n }, () => (rng.uniform() < 0.2 ? 1 : rng.uniform()));
      const sorted = Float64Array.from(values).sort();
      for (const level of [0.5, 0.8, 0.9, 0.95]) {
        expect(centralInterval(values, level)).toEqual([sortedQuantile(sorted, (1 - level) / 2), sortedQuantile(sorted, (1 + level) / 2)]);
      }
    }
  });
});
