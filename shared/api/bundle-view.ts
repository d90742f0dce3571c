// What the screens show of a posterior source: its identity, plus the bundle file's
// provenance (title, licence, date range, counts, method) when the source is a bundle.
import type { PosteriorSource } from '../delay/predictive';
import type { BundleView } from './analysis-schema';

interface BundleMetadata {
  readonly title: string;
  readonly license: string;
  readonly dateRange: { readonly first: string; readonly last: string };
  readonly flights: number;
  readonly routes: number;
  readonly airports: number;
  readonly method: string;
}

/** The source's identity, plus the bundle file's provenance when the source is one. */
export function bundleView(source: PosteriorSource): BundleView {
  const view: BundleView = { id: source.info.id, model: source.info.model, source: source.info.source };
  const meta = (source as { bundle?: { metadata?: BundleMetadata } }).bundle?.metadata;
  if (!meta) return view;
  return {
    ...view,
    provenance: { title: meta.title, license: meta.license, dateFirst: meta.dateRange.first, dateLast: meta.dateRange.last, flights: meta.flights, routes: meta.routes, airports: meta.airports, method: meta.method },
  };
}
