import { describe, expect, it } from 'vitest';
import { bundleDetailsOf } from '../../../shared/report/bundle-details';
import type { PosteriorSource } from '../../../shared/delay/predictive';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

describe('bundleDetailsOf', () => {
  it('reads the date range and flight count of a loaded bundle', () => {
    const source = { ...syntheticSource(), bundle: { metadata: { dateRange: { first: '2001-01-01', last: '2001-03-31' }, flights: 231_000 } } } as PosteriorSource;
    expect(bundleDetailsOf(source)).toEqual({ dateRange: { first: '2001-01-01', last: '2001-03-31' }, flights: 231_000 });
  });

  it('gives nothing for a source that is not a bundle, and skips malformed fields', () => {
    expect(bundleDetailsOf(syntheticSource())).toBeUndefined();
    const odd = { ...syntheticSource(), bundle: { metadata: { dateRange: { first: 1 }, flights: 'many' } } } as PosteriorSource;
    expect(bundleDetailsOf(odd)).toEqual({ dateRange: undefined, flights: undefined });
  });
});
