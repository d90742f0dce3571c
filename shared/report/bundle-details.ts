// The facts about a posterior bundle that reports print under "Data provenance" but that
// PosteriorSourceInfo does not carry: the date range and size of the fit data.
import type { BundlePosteriorSource } from '../delay/bundle/posterior-source';
import type { PosteriorSource } from '../delay/predictive';
import type { BundleDetails } from './report-model';

/** The bundle's date range and flight count when the source is a loaded bundle; undefined otherwise. */
export function bundleDetailsOf(source: PosteriorSource): BundleDetails | undefined {
  if (!('bundle' in source)) return undefined;
  // A source with a `bundle` field is a BundlePosteriorSource (shared/delay/bundle/posterior-source.ts).
  const meta = (source as BundlePosteriorSource).bundle.metadata;
  return { dateRange: { first: meta.dateRange.first, last: meta.dateRange.last }, flights: meta.flights };
}
