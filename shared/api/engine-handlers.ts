// The engine's requests: parse and score trips, chart one connection, describe the bundle.
//
// Pure shared/ code run by both hosts off the UI thread: the page's Web Worker and the
// Electron main side's worker thread. Parsing and scoring are the intake and risk
// engines'; this module only calls them and shapes their output for the screens.
import type { ParsedTrips } from '../itinerary/types';
import type { PosteriorSource } from '../delay/predictive';
import type { MakeCurve, MarginDistribution, MctRule, ScoreOptions, ScoredTrips } from '../risk/types';
import type { AnalysisSettings } from '../workspace/settings';
import type { Analysis, BundleView, ConnectionCurve } from './analysis-schema';
import { groupView, scoredTripView, unscoredTripViews } from './trip-views';
import { bundleView } from './bundle-view';
import type { ReportExport, ReportExportKind } from './contract';
import { connectionsCsv, reportDocument } from '../report/build-report';
import { bundleDetailsOf } from '../report/bundle-details';

/** The engines the handlers call; wired to the real ones in engine-deps.ts. */
export interface EngineDeps {
  readonly parseTrips: (text: string) => ParsedTrips;
  readonly loadPosteriorSource: () => Promise<PosteriorSource>;
  /** scoreTrips, or the same on more threads (the same result either way). */
  readonly scoreTrips: (parsed: ParsedTrips, source: PosteriorSource, options: ScoreOptions) => ScoredTrips | Promise<ScoredTrips>;
  /** P(make) against layover and the margin distribution of one connection of a scored trip. */
  readonly connectionCurves: (scored: ScoredTrips, tripId: string, connectionIndex: number, source: PosteriorSource, options: ScoreOptions) => { curve: MakeCurve; margin: MarginDistribution };
  readonly countryOf: (iata: string) => string | undefined;
  readonly nowMs: () => number;
}

/** The requests served here, in the order the thread client forwards them. */
export const ENGINE_REQUEST_NAMES = ['analyzeTrips', 'connectionCurve', 'getBundleInfo', 'exportReport'] as const;

export interface EngineHandlers {
  analyzeTrips(text: string, settings: AnalysisSettings): Promise<Analysis>;
  connectionCurve(analysisId: string, tripId: string, connectionIndex: number): Promise<ConnectionCurve>;
  getBundleInfo(): Promise<{ bundle: BundleView | null; error: string | null }>;
  exportReport(analysisId: string, kind: ReportExportKind): Promise<ReportExport>;
}

/** Analyses kept for follow-up curve requests; the page only asks about recent ones. */
const KEPT_ANALYSES = 4;
/** Width of the margin chart's bars. */
export const MARGIN_BIN_MINUTES = 5;

export function scoreOptionsFor(settings: AnalysisSettings, countryOf: (iata: string) => string | undefined): ScoreOptions {
  const mctRules: MctRule[] = settings.mctOverrides.map((o, i) => ({ airport: o.airport, type: o.connectionType, minutes: o.minutes, line: i + 1 }));
  return {
    target: settings.targetProbability,
    rebookGapMinutes: settings.rebookGapMinutes,
    seed: settings.seed,
    mctRules,
    transferMinutes: settings.transferAllowanceMinutes,
    countryOf,
  };
}

/**
 * Sums the engine's one-minute bins (x - 1, x] into bars (m, m + width] with m a multiple of
 * width, so that every bar lies wholly on one side of zero: bars with m < 0 are misses.
 */
export function rebinMargin(margin: MarginDistribution, width: number): { marginMinutes: number; probability: number }[] {
  const bins = new Map<number, number>();
  margin.marginMinutes.forEach((x, i) => {
    const start = Math.ceil(x / width) * width - width + 0; // + 0 turns -0 into 0

    bins.set(start, (bins.get(start) ?? 0) + (margin.probability[i] ?? 0));
  });
  return [...bins.entries()].sort((a, b) => a[0] - b[0]).map(([marginMinutes, p]) => ({ marginMinutes, probability: Math.min(1, Math.max(0, p)) }));
}

function clamp01(p: number): number {
  return Math.min(1, Math.max(0, p));
}

export function createEngineHandlers(deps: EngineDeps): EngineHandlers {
  const kept = new Map<string, { scored: ScoredTrips; options: ScoreOptions; source: PosteriorSource }>();
  let nextId = 1;
  // The loader caches (per bundle choice, see history-handlers.ts); a failed load is retried.
  const getSource = (): Promise<PosteriorSource> => deps.loadPosteriorSource();

  return {
    async analyzeTrips(text, settings) {
      const t0 = deps.nowMs();
      const parsed = deps.parseTrips(text);
      const t1 = deps.nowMs();
      const analysisId = String(nextId++);
      const base = { analysisId, format: parsed.format, targetProbability: settings.targetProbability, parseMs: t1 - t0 };
      let loaded: PosteriorSource;
      try {
        loaded = await getSource();
      } catch (err) {
        const reason = `No posterior bundle could be loaded, so the trips are read but not scored: ${err instanceof Error ? err.message : String(err)}`;
        return { ...base, problems: [...parsed.problems], trips: unscoredTripViews(parsed, 'No posterior bundle is loaded.'), group: null, bundle: null, scoringError: reason, intervalLevel: 0.9, caution: '', scoreMs: 0 };
      }
      const options = scoreOptionsFor(settings, deps.countryOf);
      const t2 = deps.nowMs();
      const scored = await deps.scoreTrips(parsed, loaded, options);
      const scoreMs = deps.nowMs() - t2;
      kept.set(analysisId, { scored, options, source: loaded });
      for (const key of kept.keys()) if (kept.size > KEPT_ANALYSES) kept.delete(key);
      return {
        ...base,
        problems: [...scored.problems],
        trips: scored.trips.map(scoredTripView),
        group: scored.trips.length ? groupView(scored) : null,
        bundle: bundleView(loaded),
        scoringError: null,
        intervalLevel: scored.intervalLevel,
        caution: scored.caution,
        scoreMs,
      };
    },

    async connectionCurve(analysisId, tripId, connectionIndex) {
      const entry = kept.get(analysisId);
      if (!entry) throw new Error(`analysis ${analysisId} is no longer kept; analyse the trips again`);
      // The bundle it was scored with, even if another has been chosen since.
      const { curve, margin } = deps.connectionCurves(entry.scored, tripId, connectionIndex, entry.source, entry.options);
      return {
        tripId,
        connectionIndex,
        layoverMinutes: margin.layoverMinutes,
        mctMinutes: curve.mctMinutes,
        targetProbability: curve.target,
        minLayoverMinutes: curve.minLayoverMinutes,
        points: curve.points.map((p) => ({ layoverMinutes: p.layoverMinutes, p: clamp01(p.pMake), lo: clamp01(p.lo), hi: clamp01(p.hi) })),
        margin: rebinMargin(margin, MARGIN_BIN_MINUTES),
        binMinutes: MARGIN_BIN_MINUTES,
      };
    },

    async exportReport(analysisId, kind) {
      const entry = kept.get(analysisId);
      if (!entry) throw new Error(`analysis ${analysisId} is no longer kept; analyse the trips again`);
      // nowMs is a timer for durations (performance.now in the hosts), not a wall clock.
      const stamp = new Date().toISOString();
      const day = stamp.slice(0, 10);
      if (kind === 'connections') return { title: 'Connections', fileName: `layline-connections-${day}.csv`, mimeType: 'text/csv', text: connectionsCsv(entry.scored) };
      const doc = reportDocument(entry.scored, kind, { generatedAt: stamp, bundleDetails: bundleDetailsOf(entry.source) });
      return { title: doc.title, fileName: `layline-${kind === 'manager' ? 'report' : 'briefings'}-${day}.html`, mimeType: 'text/html', text: doc.html };
    },

    async getBundleInfo() {
      try {
        return { bundle: bundleView(await getSource()), error: null };
      } catch (err) {
        return { bundle: null, error: err instanceof Error ? err.message : String(err) };
      }
    },
  };
}
