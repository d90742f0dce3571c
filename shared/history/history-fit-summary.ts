// The summary of a history fit that the CLI prints as JSON and the app's diagnostics view shows:
// import counts, the held-out split, per delay kind the held-out log score, the tail
// calibration table (pooled and busiest routes), the QQ table, and what the bundle holds.
import type { Candidate } from '../delay/bundle/fit-bundle';
import type { HistoryFitResult, KindEvaluation } from './history-fit';

export interface KindSummary {
  readonly flights: number;
  readonly natsPerFlight: number;
  readonly calibration: KindEvaluation['pooled'];
  readonly busiestRoutes: KindEvaluation['busiestRoutes'];
  readonly routeMedianAbsRelativeError: KindEvaluation['routeMedianAbsRelativeError'];
  readonly qq: KindEvaluation['qq'];
  readonly baseline: KindEvaluation['baseline'];
}

export interface HistoryFitSummary {
  readonly model: 'route';
  readonly family: string;
  readonly method: HistoryFitResult['method'];
  readonly elapsedMs: number;
  readonly import: HistoryFitResult['summary'];
  readonly holdout: HistoryFitResult['holdout'];
  readonly heldOut: { readonly arrival: KindSummary; readonly departure: KindSummary | null };
  readonly bundle: {
    readonly id: string;
    readonly bytes: number;
    readonly flights: number;
    readonly routes: number;
    readonly airports: number;
    readonly departures: 'fitted' | 'derived';
    readonly diagnostics: HistoryFitResult['bundle']['metadata']['diagnostics'];
  };
}

function kindSummary(e: KindEvaluation): KindSummary {
  return {
    flights: e.flights,
    natsPerFlight: e.natsPerFlight,
    calibration: e.pooled,
    busiestRoutes: e.busiestRoutes,
    routeMedianAbsRelativeError: e.routeMedianAbsRelativeError,
    qq: e.qq,
    baseline: e.baseline,
  };
}

/** The summary of a finished fit; `bytes` is the size of the bundle's JSON text. */
export function summariseHistoryFit(result: HistoryFitResult, candidate: Candidate, bytes: number): HistoryFitSummary {
  return {
    model: 'route',
    family: candidate.name,
    method: result.method,
    elapsedMs: result.elapsedMs,
    import: result.summary,
    holdout: result.holdout,
    heldOut: { arrival: kindSummary(result.arrival), departure: result.departure && kindSummary(result.departure) },
    bundle: {
      id: result.bundle.id,
      bytes,
      flights: result.bundle.metadata.flights,
      routes: result.bundle.metadata.routes,
      airports: result.bundle.metadata.airports,
      departures: result.departure ? 'fitted' : 'derived',
      diagnostics: result.bundle.metadata.diagnostics,
    },
  };
}
