import { describe, expect, it } from 'vitest';
import { collapseWeighted } from '../../../shared/inference/weighted-data';
import { createRng } from '../../../shared/inference/rng';

describe('collapseWeighted', () => {
  it('collapses repeated (group, value) rows into counted triples ordered by group then value', () => {
    const d = collapseWeighted([1, 0, 1, 0, 0], [7, 5, 7, -3, 5], 2);
    expect(Array.from(d.group)).toEqual([0, 0, 1]);
    expect(Array.from(d.value)).toEqual([-3, 5, 7]);
    expect(Array.from(d.count)).toEqual([1, 2, 2]);
    expect(d.groupCount).toBe(2);
  });

  it('handles non-integer values by exact equality', () => {
    const d = collapseWeighted([0, 0, 0], [0.5, 0.25, 0.5], 1);
    expect(Array.from(d.value)).toEqual([0.25, 0.5]);
    expect(Array.from(d.count)).toEqual([1, 2]);
  });

  it('keeps every row: counts sum to the number of rows on random integer data', () => {
    const rng = createRng(1);
    const n = 20_000;
    const g = Int32Array.from({ length: n }, () => rng.int(13));
    const v = Float64Array.from({ length: n }, () => rng.int(400) - 100);
    const d = collapseWeighted(g, v, 13);
    expect(d.count.reduce((a, b) => a + b, 0)).toBe(n);
    const key = new Set<string>();
    for (let i = 0; i < d.group.length; i++) key.add(`${d.group[i]}:${d.value[i]}`);
    expect(key.size).toBe(d.group.length);
  });

  it('rejects mismatched lengths, groups out of range and non-finite values', () => {
    expect(() => collapseWeighted([0], [1, 2], 1)).toThrow(/rows/);
    expect(() => collapseWeighted([3], [1], 2)).toThrow(/outside/);
    expect(() => collapseWeighted([0], [NaN], 1)).toThrow(/non-finite/);
    expect(() => collapseWeighted([0], [1], 0)).toThrow(/groupCount/);
  });
});
