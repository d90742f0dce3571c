// The posterior bundle that ships with the app (shared/data/route-posteriors.json via the
// bundle module), loaded once per engine on the first request that needs it.
import type { PosteriorSource } from '../delay/predictive';
import { loadDefaultPosteriorSource } from '../delay/bundle/default-bundle';

export async function loadBundledPosteriors(): Promise<PosteriorSource> {
  return loadDefaultPosteriorSource();
}
