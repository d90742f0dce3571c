// Everything the engine side answers, assembled once for both hosts: the Electron engine
// thread and the page's Web Worker. They differ only in how a history file is read and where
// fitted bundles are kept, and pass those in.
import type { PosteriorSource } from '../delay/predictive';
import { defaultHistoryCandidate } from '../history/default-candidate';
import type { BundleStore } from '../history/bundle-store';
import type { ParsedTrips } from '../itinerary/types';
import type { ScoredTrips, ScoreOptions } from '../risk/types';
import type { HistoryFileRef } from '../history/history-requests';
import type { HistoryPreview, HistoryReadOptions, HistoryReadResult } from '../history/read-history-source';
import { loadBundledPosteriors } from './bundled-posteriors';
import type { ApiHandlers } from './contract';
import { createEngineHandlers } from './engine-handlers';
import { realEngineDeps } from './engine-deps';
import { combineHandlers, createCoreHandlers, createPageShellHandlers, type HostInfo } from './handlers';
import { createBundleSelection, createHistoryHandlers, type LoadedChoice } from './history-handlers';

export interface EngineHostOptions {
  readonly host: HostInfo;
  readonly store: BundleStore;
  readonly previewHistory: (ref: HistoryFileRef) => Promise<HistoryPreview>;
  readonly readHistory: (ref: HistoryFileRef, options: HistoryReadOptions) => Promise<HistoryReadResult>;
  /** A timer for durations (performance.now). */
  readonly nowMs: () => number;
  /** The bundle used when none is chosen; the one that ships with the app unless a test says otherwise. */
  readonly loadDefault?: () => Promise<PosteriorSource>;
  /**
   * Scores on more threads (the Electron engine thread's helper, main/scoring/pair-workers.ts),
   * told which bundle choice the source was loaded for so that a helper can load the same.
   * The result must be scoreTrips's, which is used when this is absent.
   */
  readonly scoreTrips?: (parsed: ParsedTrips, source: PosteriorSource, options: ScoreOptions, loaded: LoadedChoice | undefined) => Promise<ScoredTrips>;
}

export function createEngineHost(options: EngineHostOptions): ApiHandlers {
  const loadDefault = options.loadDefault ?? loadBundledPosteriors;
  const selection = createBundleSelection(options.store, loadDefault);
  const score = options.scoreTrips;
  const engine = createEngineHandlers(realEngineDeps(options.nowMs, selection.load, score && ((parsed, source, o) => score(parsed, source, o, selection.loadedFor(source)))));
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
