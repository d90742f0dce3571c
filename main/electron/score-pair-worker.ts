// The engine thread's helper for scoring (main/scoring/pair-workers.ts), started by the engine
// thread with the same bundle folder: it loads the bundle the engine scores with, the one that
// ships with the app or a fitted one from the folder, and keeps it for the next request while
// the engine's choice stays the same.
import { workerData } from 'node:worker_threads';
import { loadDefaultPosteriorSource } from '../../shared/delay/bundle/default-bundle';
import { createBundleSource } from '../../shared/delay/bundle/posterior-source';
import type { PosteriorSource } from '../../shared/delay/predictive';
import { BundleLibrary } from '../history/bundle-library';
import { servePairRequests } from '../scoring/pair-worker-host';
import { checkEngineSourceSpec } from './engine-source-spec';

const bundleFolder = (workerData as { bundleFolder?: unknown } | null)?.bundleFolder;
if (typeof bundleFolder !== 'string' || bundleFolder === '') throw new Error('the scoring helper needs workerData.bundleFolder');
const library = new BundleLibrary(bundleFolder);
let kept: { key: string; source: Promise<PosteriorSource> } | null = null;

servePairRequests((spec) => {
  const { choice, generation } = checkEngineSourceSpec(spec);
  if (choice.kind === 'default') return loadDefaultPosteriorSource();
  // The engine reloads when its choice changes (its generation); so does this thread.
  const key = `${generation}:${choice.id}`;
  if (kept?.key !== key) {
    const source = library.load(choice.id).then((bundle) => createBundleSource(bundle));
    kept = { key, source };
    source.catch(() => {
      if (kept?.source === source) kept = null;
    });
  }
  return kept.source;
});
