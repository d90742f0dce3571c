// The history requests of the contract (preview a file, fit it as a job, save its bundle,
// list and choose bundles) and the choice of bundle the engine scores with.
//
// Both hosts run this where the engine runs: the Electron engine thread (files by path, bundles
// in a folder) and the page's Web Worker (picked files, bundles in memory). They pass how to
// read a file reference and where bundles are kept; everything else is shared.
import type { PosteriorSource } from '../delay/predictive';
import { createBundleSource } from '../delay/bundle/posterior-source';
import type { Candidate } from '../delay/bundle/fit-bundle';
import type { ActiveBundle, BundleStore } from '../history/bundle-store';
import { HistoryFitJobs } from '../history/history-fit-jobs';
import type { HistoryFileRef } from '../history/history-requests';
import type { HistoryPreview, HistoryReadOptions, HistoryReadResult } from '../history/read-history-source';
import { bundleView } from './bundle-view';
import { parseResult, type ApiHandlers } from './contract';

export const HISTORY_REQUEST_NAMES = ['previewHistory', 'startHistoryFit', 'historyFitStatus', 'cancelHistoryFit', 'saveFittedBundle', 'listBundles', 'useBundle'] as const;
export type HistoryHandlers = Pick<ApiHandlers, (typeof HISTORY_REQUEST_NAMES)[number]>;

/** The bundle the engine scores with: the one chosen in the store, else the default. */
export interface BundleSelection {
  /** The source in use (loaded once per choice). */
  readonly load: () => Promise<PosteriorSource>;
  /** Bumped on every change of choice, so the engine knows to reload. */
  readonly generation: () => number;
  readonly choose: (choice: ActiveBundle) => Promise<ActiveBundle>;
  /**
   * The choice a source from load() was loaded for, and the generation then (so that another
   * thread can load the same again, and knows when to reload).
   */
  readonly loadedFor: (source: PosteriorSource) => LoadedChoice | undefined;
}

export interface LoadedChoice {
  readonly choice: ActiveBundle;
  readonly generation: number;
}

export function createBundleSelection(store: BundleStore, loadDefault: () => Promise<PosteriorSource>): BundleSelection {
  let generation = 0;
  let cached: { generation: number; source: Promise<PosteriorSource> } | null = null;
  const choices = new WeakMap<PosteriorSource, LoadedChoice>();
  const loadActive = async (): Promise<PosteriorSource> => {
    const at = generation;
    const active = await store.active();
    const source = active.kind === 'default' ? await loadDefault() : createBundleSource(await store.load(active.id));
    choices.set(source, { choice: active, generation: at });
    return source;
  };
  return {
    load: () => {
      if (cached?.generation !== generation) {
        const entry = { generation, source: loadActive() };
        // A failed load is not kept, so a later request tries again.
        entry.source.catch(() => {
          if (cached === entry) cached = null;
        });
        cached = entry;
      }
      return cached.source;
    },
    generation: () => generation,
    loadedFor: (source) => choices.get(source),
    choose: async (choice) => {
      await store.use(choice);
      generation++;
      return store.active();
    },
  };
}

export interface HistoryHostDeps {
  readonly store: BundleStore;
  readonly selection: BundleSelection;
  /** The bundle that ships with the app. */
  readonly loadDefault: () => Promise<PosteriorSource>;
  readonly preview: (ref: HistoryFileRef) => Promise<HistoryPreview>;
  readonly read: (ref: HistoryFileRef, options: HistoryReadOptions) => Promise<HistoryReadResult>;
  /** The model to refit: the default bundle's choice. */
  readonly candidate: () => Promise<Candidate>;
  readonly now?: () => number;
}

export function createHistoryHandlers(deps: HistoryHostDeps): HistoryHandlers {
  const jobs = new HistoryFitJobs({
    library: deps.store,
    read: deps.read,
    candidate: deps.candidate,
    baseline: async () => {
      const source = await deps.selection.load();
      return { name: `the bundle in use (${source.info.id})`, source };
    },
    now: deps.now,
  });
  return {
    previewHistory: async (ref) => parseResult('previewHistory', await deps.preview(ref)),
    startHistoryFit: async (args) => jobs.start(args),
    // The jobs and stores hand out readonly views; parsing gives the contract's own (mutable) types.
    historyFitStatus: async (jobId) => parseResult('historyFitStatus', jobs.status(jobId)),
    cancelHistoryFit: async (jobId) => jobs.cancel(jobId),
    saveFittedBundle: async (jobId) => parseResult('saveFittedBundle', await jobs.save(jobId)),
    listBundles: async () => {
      const { entries, unreadable } = await deps.store.list();
      return parseResult('listBundles', { default: bundleView(await deps.loadDefault()), entries, unreadable, active: await deps.store.active() });
    },
    useBundle: async (choice) => deps.selection.choose(choice),
  };
}
