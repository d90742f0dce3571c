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
  /**
   * Optional: min(cap, sample(rng)) into out[start], out[start + stride], ..., the same values
   * as calls of sample in that order. A double returned from a call that is not inlined is
   * boxed on the heap; the trip simulation draws hundreds of thousands, so a distribution that
   * can fill them in place says so here.
   */
  sampleInto?(rng: Rng, out: Float64Array, start: number, stride: number, cap: number): void;
  /**
   * Present when the distribution is a plain Gumbel: its location and scale, so that a mixture
   * of Gumbels can sample with the formula written out (see mixtureDistribution) rather than a
   * call per draw.
   */
  readonly gumbel?: { readonly location: number; readonly scale: number };
}

/**
 * What the risk tables can use when a distribution offers it: F or f at lo, lo + step, ...,
 * lo + (out.length - 1) step (step 1 when not given; the tables also ask for 0.5), written into
 * out, equal to cdf(x) and pdf(x) within 1e-10. Evaluating a run of points at once lets a
 * distribution step its terms by constant ratios (e^{-z} of a Gumbel) instead of starting every
 * point afresh, which is where a scoring run spends most of its time. Without them the tables
 * call cdf and pdf point by point.
 */
export interface GridEvaluation {
  cdfGrid?(lo: number, out: Float64Array, step?: number): void;
  pdfGrid?(lo: number, out: Float64Array, step?: number): void;
  /**
   * weight * F (or weight * f when `density`) added into out at lo + i step, the same values
   * as the grids above times weight: a mixture sums its components straight into its output.
   */
  addGrid?(lo: number, out: Float64Array, step: number, weight: number, density: boolean): void;
  /**
   * S at the whole minutes xs[0], ..., xs[count - 1] into out[0..count), equal to survival(x)
   * to rounding (relative differences of order 1e-14 far into a tail; tested to 1e-13): the risk
   * tables' tail nodes, dozens per table, each of which a call of survival would return boxed
   * (and a Gumbel can step its terms from node to node).
   */
  survivalAt?(xs: Int32Array, count: number, out: Float64Array): void;
  /** weight * S(xs[k]) added into out[k], for k < count (a mixture sums its components so). */
  addSurvivalAt?(xs: Int32Array, count: number, out: Float64Array, weight: number): void;
  /**
   * Where the density jumps, as [x, J, K]: J = f(x+) - f(x-) and K = f'(x+) - f'(x-) (a
   * component whose support starts at x). The risk engine's density tables correct the
   * trapezoid for each (shared/risk/delay-table.ts), so such a density need not fall back to
   * exact cell masses.
   */
  densityJumps?(): readonly (readonly [number, number, number])[];
  /**
   * The width in minutes of the distribution's narrowest feature away from those jumps (the
   * smallest Gumbel scale of a mixture, say). The risk engine's density tables choose their
   * quadrature step from it: the trapezoid rule's error on such a density falls like
   * exp(-pi^2 scale / step). Without it, tables keep a one-minute step.
   */
  featureScale?(): number;
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
