// Held-out evaluation of a candidate: fit on one part of the sample, score on the rest.
//
// Two splits, as the issue asks: every fifth calendar day held out (the fit has seen every
// month, so a model with month effects uses the fitted effect of the held-out day's month),
// and January-May fitted with June predicted (a month the fit has not seen, so month effects
// are drawn new and the predictive integrates over them).
import { createBundleSource, type BundlePosteriorSource } from '../../shared/delay/bundle/posterior-source';
import type { HeldOutReport } from '../../shared/delay/bundle/bundle-schema';
import { fitBundle, type Candidate, type FitBundleOptions } from '../../shared/delay/bundle/fit-bundle';
import { CLEANING_RULE, type FlightColumns } from '../../shared/delay/evaluation/flight-columns';
import { mixDrawSets } from '../../shared/delay/evaluation/mixture-draws';
import { logPredictiveDensity, qqTable, tailCalibration, type DrawSet } from '../../shared/delay/evaluation/scores';
import { compressDelays, indexRoutes, type PeriodWeightedData } from '../../shared/delay/evaluation/weighted-delays';
import type { WeightedData } from '../../shared/inference/model';

export type SplitName = 'held-out days' | 'future month';

export interface SplitMasks {
  readonly name: SplitName;
  readonly train: Uint8Array;
  readonly test: Uint8Array;
  /** Whether the test months were in the fit (use their fitted month effects). */
  readonly monthsSeen: boolean;
}

/** Draws per route used for scoring: enough for stable averages, few enough to score 600,000 flights quickly. */
export const SCORING_DRAWS = 24;

/** The test data regrouped by (route, month), for a log score with month-conditional predictives. */
function byRouteMonth(data: PeriodWeightedData): WeightedData {
  const P = data.periodCount;
  return { groupCount: data.groupCount * P, group: Int32Array.from(data.group, (g, i) => g * P + data.period[i]!), value: data.value, count: data.count };
}

/** Scores a fitted bundle on test flights. */
export function scoreBundle(source: BundlePosteriorSource, flights: FlightColumns, test: Uint8Array, monthsSeen: boolean, candidate: string, split: SplitName): HeldOutReport {
  const index = indexRoutes(flights, test);
  const useMonths = monthsSeen && source.bundle.model.monthEffects.length > 0;
  const labels = useMonths ? source.bundle.months.labels : undefined;
  const data = compressDelays(flights, index, test, {
    minDelay: CLEANING_RULE.minDelayMinutes,
    maxDelay: CLEANING_RULE.maxDelayMinutesExclusive - 1,
    ...(labels ? { periodLabels: labels } : {}),
  });
  const P = data.periodCount;
  const routeMonth = (g: number, q: number): DrawSet => {
    const r = index.routes[g]!;
    return useMonths ? source.routeInMonth(r.origin, r.destination, 'arrival', data.periodLabels[q]!) : source.route(r.origin, r.destination, 'arrival');
  };
  // Per route: held-out flights per month, for the month mixture.
  const monthFlights = new Float64Array(data.groupCount * P);
  for (let i = 0; i < data.group.length; i++) monthFlights[data.group[i]! * P + data.period[i]!]! += data.count[i]!;
  const routeCache = new Map<number, DrawSet>();
  const perRoute = (g: number): DrawSet => {
    let set = routeCache.get(g);
    if (!set) {
      if (!useMonths) set = routeMonth(g, 0);
      else {
        const qs = Array.from({ length: P }, (_, q) => q).filter((q) => monthFlights[g * P + q]! > 0);
        set = mixDrawSets(qs.map((q) => routeMonth(g, q)), qs.map((q) => monthFlights[g * P + q]!));
      }
      routeCache.set(g, set);
    }
    return set;
  };
  const lpd = useMonths ? logPredictiveDensity(byRouteMonth(data), (gq) => routeMonth(Math.floor(gq / P), gq % P)) : logPredictiveDensity(data, perRoute);
  const calibration = tailCalibration(data, perRoute);
  const qq = qqTable(data, perRoute);
  return {
    candidate,
    split,
    flights: data.flights,
    natsPerFlight: lpd.natsPerFlight,
    pooled: calibration.pooled.map((r) => ({ ...r, interval: [r.interval[0], r.interval[1]] as [number, number] })),
    routeMedianAbsRelativeError: calibration.routeMedianAbsRelativeError.map((r) => ({ ...r })),
    qq,
  };
}

/** Fits a candidate on a split's training flights and scores it on its test flights. */
export async function evaluateCandidate(
  flights: FlightColumns,
  split: SplitMasks,
  candidate: Candidate,
  options: Omit<FitBundleOptions, 'metadata'> & { readonly metadata: FitBundleOptions['metadata'] },
): Promise<HeldOutReport> {
  const fitted = await fitBundle(flights, split.train, candidate, options);
  const source = createBundleSource(fitted.bundle, { drawCount: SCORING_DRAWS, isKnownAirport: () => true });
  return { ...scoreBundle(source, flights, split.test, split.monthsSeen, candidate.name, split.name), fitMs: fitted.fitMs };
}
