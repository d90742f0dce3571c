// What the risk engine needs from a posterior bundle: per route and kind, a set of
// posterior draws, each giving a predictive distribution of the delay in minutes.
//
// Parameter uncertainty lives in the spread across draws; the delay's own randomness
// lives inside each draw's distribution. The risk engine averages over draws for the
// posterior predictive and takes quantiles across draws for credible intervals.
import type { Rng } from '../inference/rng';

/** A delay in minutes: actual minus scheduled, negative when early. */
export interface DelayDistribution {
  /** P(delay <= x). */
  cdf(x: number): number;
  /** P(delay > x), accurate in the far right tail. */
  survival(x: number): number;
  pdf(x: number): number;
  /** log pdf(x), computed without underflow far in the tails (optional; scores use it when present). */
  logPdf?(x: number): number;
  sample(rng: Rng): number;
}

export type DelayKind = 'arrival' | 'departure';

/**
 * How much data stands behind a route's posterior:
 * 'route' - the route itself was in the fit data;
 * 'airports' - pooled from its origin and destination airports' effects;
 * 'population' - at least one airport was never seen, so only population values apply.
 */
export type PoolingLevel = 'route' | 'airports' | 'population';

export interface RoutePosterior {
  readonly origin: string;
  readonly destination: string;
  readonly kind: DelayKind;
  readonly pooling: PoolingLevel;
  /** Flights of this route in the fit data (0 when pooled). */
  readonly flights: number;
  /** True when this kind was derived rather than fitted (e.g. departures from arrivals). */
  readonly derived: boolean;
  readonly drawCount: number;
  /** The predictive delay distribution under posterior draw s, 0 <= s < drawCount. */
  draw(s: number): DelayDistribution;
}

export interface PosteriorSourceInfo {
  readonly id: string;
  readonly model: string;
  readonly source: string;
}

export interface PosteriorSource {
  readonly info: PosteriorSourceInfo;
  /** Throws an Error naming the code when an airport code is not a known IATA code. */
  route(origin: string, destination: string, kind: DelayKind): RoutePosterior;
}
