// The route posteriors that ship with Layline: shared/data/route-posteriors.json, fitted by
// `npm run fit:default` from the public on-time sample and committed, so nothing is fitted
// at start-up. Parsed and checked once, on first use.
import bundleJson from '../../data/route-posteriors.json';
import { createBundleSource, type BundlePosteriorSource, type BundleSourceOptions } from './posterior-source';

let cached: BundlePosteriorSource | null = null;

/** The default PosteriorSource (validated on first call, then cached). */
export function loadDefaultPosteriorSource(): BundlePosteriorSource {
  cached ??= createBundleSource(bundleJson);
  return cached;
}

/** The default bundle with other options (e.g. fewer draws), not cached. */
export function loadDefaultPosteriorSourceWith(options: BundleSourceOptions): BundlePosteriorSource {
  return createBundleSource(bundleJson, options);
}
