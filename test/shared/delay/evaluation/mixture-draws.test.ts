import { describe, expect, it } from 'vitest';
import type { DelayDistribution } from '../../../../shared/delay/predictive';
import { mixDrawSets } from '../../../../shared/delay/evaluation/mixture-draws';
import type { DrawSet } from '../../../../shared/delay/evaluation/scores';

function point(survivalAt: number): DelayDistribution {
  return { cdf: () => 1 - survivalAt, survival: () => survivalAt, pdf: () => survivalAt, sample: () => survivalAt };
}
const set = (...values: number[]): DrawSet => ({ drawCount: values.length, draw: (s) => point(values[s]!) });

describe('mixDrawSets', () => {
  it('mixes draw s of each set with normalised weights', () => {
    const mixed = mixDrawSets([set(0.1, 0.2), set(0.5, 0.6)], [3, 1]);
    expect(mixed.draw(0).survival(0)).toBeCloseTo(0.75 * 0.1 + 0.25 * 0.5, 12);
    expect(mixed.draw(1).survival(0)).toBeCloseTo(0.75 * 0.2 + 0.25 * 0.6, 12);
  });

  it('rejects mismatched draw counts, negative weights and empty input', () => {
    expect(() => mixDrawSets([set(0.1), set(0.1, 0.2)], [1, 1])).toThrow(/same number of draws/);
    expect(() => mixDrawSets([set(0.1), set(0.2)], [1, -1])).toThrow(/non-negative/);
    expect(() => mixDrawSets([], [])).toThrow(/at least one/);
  });
});
