// The facts about a posterior bundle that reports print under "Data provenance" but that
// PosteriorSourceInfo does not carry: the date range and size of the fit data.
import type { PosteriorSource } from '../delay/predictive';
import type { BundleDetails } from './report-model';

/** What a loaded bundle source carries (shared/delay/bundle: BundlePosteriorSource.bundle.metadata). */
interface BundleMetadata {
  readonly dateRange?: { readonly first?: unknown; readonly last?: unknown };
  readonly flights?: unknown;
}

function metadataOf(source: PosteriorSource): BundleMetadata | undefined {
  const bundle: unknown = (source as { readonly bundle?: unknown }).bundle;
  if (typeof bundle !== 'object' || bundle === null) return undefined;
  const metadata: unknown = (bundle as { readonly metadata?: unknown }).metadata;
  return typeof metadata === 'object' && metadata !== null ? (metadata as BundleMetadata) : undefined;
}

/** The bundle's date range and flight count when the source is a loaded bundle; undefined otherwise. */
export function bundleDetailsOf(source: PosteriorSource): BundleDetails | undefined {
  const meta = metadataOf(source);
  if (!meta) return undefined;
  const { first, last } = meta.dateRange ?? {};
  return {
    dateRange: typeof first === 'string' && typeof last === 'string' ? { first, last } : undefined,
    flights: typeof meta.flights === 'number' ? meta.flights : undefined,
  };
}
