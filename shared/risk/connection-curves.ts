// The curves the UI charts for one connection: P(make) against layover with its credible band,
// and the predictive distribution of the margin layover - MCT - (A - D).
//
// Pure functions of a posterior source and the two routes; they use the same quadrature as the
// scores, so a chart and the numbers beside it agree exactly.
import type { PosteriorSource } from '../delay/predictive';
import { centralInterval, ConnectionPair, differenceQuantile, makeCurvePoints, MAX_LAYOVER_MINUTES, minimumLayover } from './connection-probability';
import { RouteTables } from './delay-table';
import { MAX_JOINT_DRAWS } from './score-trips';
import type { MakeCurve, MarginDistribution } from './types';

export interface CurveRoutes {
  /** The inbound leg (its arrival posterior is used). */
  readonly inbound: { readonly from: string; readonly to: string };
  /** The outbound leg (its departure posterior is used). */
  readonly outbound: { readonly from: string; readonly to: string };
}

/** Joint draws used for a pair alone: the same rule as scoreTrips for routes with equal draw counts. */
export function connectionPairFor(source: PosteriorSource, routes: CurveRoutes, maxDraws = MAX_JOINT_DRAWS): ConnectionPair {
  const arrival = source.route(routes.inbound.from, routes.inbound.to, 'arrival');
  const departure = source.route(routes.outbound.from, routes.outbound.to, 'departure');
  const draws = Math.min(maxDraws, arrival.drawCount, departure.drawCount);
  return new ConnectionPair(new RouteTables(arrival, draws), new RouteTables(departure, draws));
}

export interface MakeCurveRequest {
  readonly mctMinutes: number;
  readonly target: number;
  readonly intervalLevel: number;
  /** Defaults: from max(0, MCT - 30) to the layover where P(make) reaches 0.995 (at least MCT + 60). */
  readonly fromMinutes?: number;
  readonly toMinutes?: number;
  readonly stepMinutes?: number;
}

/**
 * P(make) against whole-minute layovers, with its credible band and the minimum layover for the target.
 * @example makeCurve(pair, { mctMinutes: 45, target: 0.9, intervalLevel: 0.9 }).points[0].layoverMinutes // 15
 */
export function makeCurve(pair: ConnectionPair, request: MakeCurveRequest): MakeCurve {
  const from = request.fromMinutes ?? Math.max(0, request.mctMinutes - 30);
  const upper = request.mctMinutes + differenceQuantile(pair, 0.995);
  const to = request.toMinutes ?? Math.min(MAX_LAYOVER_MINUTES, Math.max(from + 1, request.mctMinutes + 60, upper));
  return {
    mctMinutes: request.mctMinutes,
    target: request.target,
    intervalLevel: request.intervalLevel,
    minLayoverMinutes: minimumLayover(pair, request.mctMinutes, request.target),
    points: makeCurvePoints(pair, { mctMinutes: request.mctMinutes, intervalLevel: request.intervalLevel, fromMinutes: from, toMinutes: to, stepMinutes: request.stepMinutes }),
  };
}

export interface MarginRequest {
  readonly layoverMinutes: number;
  readonly mctMinutes: number;
  readonly intervalLevel: number;
  /** Margin range; defaults cover the 0.1% to 99.9% predictive quantiles. */
  readonly fromMinutes?: number;
  readonly toMinutes?: number;
}

/**
 * The predictive distribution of the margin M = layover - MCT - (A - D) at whole minutes:
 * P(M <= x) = 1 - P(A - D < layover - MCT - x), with A - D continuous. Made when M >= 0.
 */
export function marginDistribution(pair: ConnectionPair, request: MarginRequest): MarginDistribution {
  const slack = request.layoverMinutes - request.mctMinutes;
  if (!Number.isInteger(slack)) throw new RangeError(`layover and MCT must be whole minutes, got ${request.layoverMinutes} and ${request.mctMinutes}`);
  const from = request.fromMinutes ?? slack - differenceQuantile(pair, 0.999);
  const to = request.toMinutes ?? slack - differenceQuantile(pair, 0.001);
  if (!(Number.isInteger(from) && Number.isInteger(to) && from <= to)) throw new RangeError(`margin range must be whole minutes with from <= to, got ${from}..${to}`);
  const marginMinutes: number[] = [];
  const cdf: number[] = [];
  const cdfLo: number[] = [];
  const cdfHi: number[] = [];
  const probability: number[] = [];
  let previous = 1 - pair.probability(slack - (from - 1));
  for (let x = from; x <= to; x++) {
    const byDraw = pair.drawProbabilities(slack - x);
    const [pLo, pHi] = centralInterval(byDraw, request.intervalLevel);
    const value = 1 - pair.probability(slack - x);
    marginMinutes.push(x);
    cdf.push(value);
    // The band of 1 - P flips the ends.
    cdfLo.push(1 - pHi);
    cdfHi.push(1 - pLo);
    probability.push(Math.max(0, value - previous));
    previous = value;
  }
  return { layoverMinutes: request.layoverMinutes, mctMinutes: request.mctMinutes, marginMinutes, cdf, probability, cdfLo, cdfHi, intervalLevel: request.intervalLevel, pMake: pair.probability(slack) };
}
