import { describe, expect, it } from 'vitest';
import { sortedQuantile } from '../../../shared/risk/connection-probability';
import { selectQuantiles } from '../../../shared/risk/trip-simulation';
import { createRng } from '../../../shared/inference/rng';

// Reference: Hyndman & Fan (1996) definition 7 (R's quantile type 7) on a fully sorted copy.
function reference(values: Float64Array, p: number): number {
  return sortedQuantile(Float64Array.from(values).sort(), p);
}

describe('selectQuantiles', () => {
  const rng = createRng(17);
  const cases: Record<string, Float64Array> = {
    // Delays like a trip's: a Gumbel bulk, some rebookings of 180 minutes, a few capped at two days.
    'trip delays': Float64Array.from({ length: 2000 }, () => {
      const u = rng.uniform();
      const x = -10 * Math.log(-Math.log(rng.uniform()));
      return u < 0.01 ? 2880 : u < 0.2 ? x + 180 : x;
    }),
    'many ties': Float64Array.from({ length: 999 }, () => Math.floor(rng.uniform() * 5)),
    'one far outlier': Float64Array.from({ length: 500 }, (_, i) => (i === 250 ? 1e9 : rng.normal())),
    'all equal': new Float64Array(300).fill(7),
    'two values': Float64Array.of(5, -1),
    'one value': Float64Array.of(42),
  };
  it.each(Object.entries(cases))('matches definition 7 on a sorted copy (%s)', (_name, values) => {
    const before = Float64Array.from(values);
    const ps = [0, 0.05, 0.1, 0.5, 0.9, 0.95, 0.999, 1];
    const got = selectQuantiles(values, ps);
    ps.forEach((p, k) => expect(got[k], `p=${p}`).toBe(reference(values, p)));
    // The same with the range passed in, as the trip loop does.
    const sorted = Float64Array.from(values).sort();
    expect(selectQuantiles(values, ps, sorted[0], sorted[sorted.length - 1])).toEqual(got);
    expect(values).toEqual(before);
  });

  it('gives NaN for no values', () => {
    expect(selectQuantiles(new Float64Array(0), [0.5])).toEqual([Number.NaN]);
  });
});
