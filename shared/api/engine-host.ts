// Everything the engine side answers, assembled once for both hosts: the Electron engine
// thread and the page's Web Worker. They differ only in how a history file is read and where
// fitted bundles are kept, and pass those in.
import type { PosteriorSource } from '../delay/predictive';
import { defaultHistoryCandidate } from '../history/default-candidate';
import type { BundleStore } from '../history/bundle-store';
import type { HistoryFileRef } from '../history/history-requests';
import type { HistoryPreview, HistoryReadOptions, HistoryReadResult } from '../history/read-history-source';
import { loadBundledPosteriors } from './bundled-posteriors';
import type { ApiHandlers } from './contract';
import { createEngineHandlers } from './engine-handlers';
import { realEngineDeps } from './engine-deps';
import { combineHandlers, createCoreHandlers, createPageShellHandlers, type HostInfo } from './handlers';
import { createBundleSelection, createHistoryHandlers } from './history-handlers';

export interface EngineHostOptions {
  readonly host: HostInfo;
  readonly store: BundleStore;
  readonly previewHistory: (ref: HistoryFileRef) => Promise<HistoryPreview>;
  readonly readHistory: (ref: HistoryFileRef, options: HistoryReadOptions) => Promise<HistoryReadResult>;
  /** A timer for durations (performance.now). */
  readonly nowMs: () => number;
  /** The bundle used when none is chosen; the one that ships with the app unless a test says otherwise. */
  readonly loadDefault?: () => Promise<PosteriorSource>;
}

export function createEngineHost(options: EngineHostOptions): ApiHandlers {
  const loadDefault = options.loadDefault ?? loadBundledPosteriors;
  const selection = createBundleSelection(options.store, loadDefault);
  const engine = createEngineHandlers(realEngineDeps(options.nowMs, selection.load));
  const history = createHistoryHandlers({
    store: options.store,
    selection,
    loadDefault,
    preview: options.previewHistory,
    read: options.readHistory,
    candidate: async () => defaultHistoryCandidate(),
  });
  return combineHandlers(createCoreHandlers(options.host), { ...engine, ...history }, createPageShellHandlers());
}
