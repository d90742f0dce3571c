// The `route` delay model: each route's Gumbel location, log-scale and (mixture variant) logit
// disrupted weight pooled toward origin-airport and destination-airport effects and population
// hyperparameters, with a predictive for routes and airports absent from the data.
//
// Build data with collapseRoutes(origin codes, destination codes, delays) -> { data, airports,
// airportCodes, routeKeys }, then createRouteModel / createRouteMixtureModel(data, airports).
// Layout of θ (offsets in model.layout, names in model.names), one block per hierarchy in the
// order location, logScale, logitWeight (mixture only):
//   [pop, logSigmaGroup, logSigmaOrigin, logSigmaDest, zOrigin[0..A), zDest[0..A), zGroup[0..R)]
//   q[r] = pop + e^logSigmaOrigin zOrigin[origin(r)] + e^logSigmaDest zDest[dest(r)] + e^logSigmaGroup zGroup[r]
// then, for mixtures, [disrupted_shift, disrupted_log_excess]:
//   location = q_location, scale = exp(q_logScale), disrupted weight = sigmoid(q_logitWeight),
//   disrupted location = location + shift, disrupted scale = scale * (1 + e^c).
// Constrained values for a route in the data: model.groupParameters(θ, r). For any route
// (seen, unseen route between seen airports, or unseen airports) under one posterior draw θ:
// routePredictive(model, θ, { route, origin, destination }, rng) with -1 for what the data lacks;
// the missing random effects are drawn from their N(0, 1) hierarchy with `rng`, so averaging
// over draws of θ gives the pooled posterior predictive. routePoolingLevel says which applies.
// Fitting: fitMap(model, { rng }) gives the mode; for posterior draws run
// fitAdvi(model, { rng, init: map.mean, initFromMap: false }) (its sds start from
// model.curvatureDiagonal) and take fit.draws(rng, S), each row a θ for the functions above.
// Cost per log-density call is linear in the triples; the point density (intervalHalfWidth 0)
// is about three times cheaper than the interval likelihood for the mixture.
import type { WeightedData } from '../../inference/model';
import type { Rng } from '../../inference/rng';
import { collapseWeighted } from '../../inference/weighted-data';
import type { DelayDistribution, PoolingLevel } from '../predictive';
import { HierarchicalDelayModel, type AirportStructure, type DelayModelOptions, type GroupParameters } from './hierarchical-delay';
import { parametersDistribution } from './predictive-parameters';

export type RouteModelOptions = Omit<DelayModelOptions, 'mixture'>;

export function createRouteModel(data: WeightedData, airports: AirportStructure, options: RouteModelOptions = {}): HierarchicalDelayModel {
  return new HierarchicalDelayModel(data, airports, { ...options, mixture: false });
}

export function createRouteMixtureModel(data: WeightedData, airports: AirportStructure, options: RouteModelOptions = {}): HierarchicalDelayModel {
  return new HierarchicalDelayModel(data, airports, { ...options, mixture: true });
}

export interface RouteData {
  readonly data: WeightedData;
  readonly airports: AirportStructure;
  /** Airport code of each airport index. */
  readonly airportCodes: readonly string[];
  /** 'ORIGIN-DEST' of each route index (group). */
  readonly routeKeys: readonly string[];
  /** Flights (rows) per route. */
  readonly flights: Float64Array;
}

/**
 * Index airports and routes and collapse flights into (route, delay, count) triples. Routes and
 * airports are numbered in order of first appearance. Throws on mismatched lengths, empty
 * codes or non-finite delays (clean the data first).
 */
export function collapseRoutes(origin: ArrayLike<string>, destination: ArrayLike<string>, delayMinutes: ArrayLike<number>): RouteData {
  const n = origin.length;
  if (destination.length !== n || delayMinutes.length !== n) throw new RangeError('origin, destination and delay need the same length');
  const airportIndex = new Map<string, number>();
  const routeIndex = new Map<string, number>();
  const airportCodes: string[] = [];
  const routeKeys: string[] = [];
  const ro: number[] = [];
  const rd: number[] = [];
  const group = new Int32Array(n);
  const airport = (code: string, row: number): number => {
    if (!code) throw new RangeError(`row ${row} has an empty airport code`);
    let a = airportIndex.get(code);
    if (a === undefined) {
      a = airportCodes.length;
      airportIndex.set(code, a);
      airportCodes.push(code);
    }
    return a;
  };
  for (let i = 0; i < n; i++) {
    const o = origin[i]!;
    const d = destination[i]!;
    const key = `${o}-${d}`;
    let r = routeIndex.get(key);
    if (r === undefined) {
      r = routeKeys.length;
      routeIndex.set(key, r);
      routeKeys.push(key);
      ro.push(airport(o, i));
      rd.push(airport(d, i));
    }
    group[i] = r;
  }
  const data = collapseWeighted(group, delayMinutes, Math.max(1, routeKeys.length));
  const flights = new Float64Array(routeKeys.length);
  for (let i = 0; i < data.group.length; i++) flights[data.group[i]!]! += data.count[i]!;
  return {
    data,
    airports: { airportCount: Math.max(1, airportCodes.length), origin: Int32Array.from(ro), destination: Int32Array.from(rd) },
    airportCodes,
    routeKeys,
    flights,
  };
}

/** Where a route's predictive comes from: route index r (or -1), airport indices (or -1). */
export interface RouteRef {
  readonly route: number;
  readonly origin: number;
  readonly destination: number;
}

export function routePoolingLevel(ref: RouteRef): PoolingLevel {
  if (ref.route >= 0) return 'route';
  return ref.origin >= 0 && ref.destination >= 0 ? 'airports' : 'population';
}

/**
 * Constrained parameters for a route under θ. Seen routes use their own effects; otherwise the
 * route effect (and any unseen airport's effect) is a fresh N(0, 1) draw from `rng` per hierarchy.
 */
export function routeParameters(model: HierarchicalDelayModel, theta: Float64Array, ref: RouteRef, rng?: Rng): GroupParameters {
  if (ref.route >= 0) return model.groupParameters(theta, ref.route);
  if (!rng) throw new RangeError('a route outside the data needs an rng to draw its random effects');
  for (const a of [ref.origin, ref.destination]) {
    if (a >= model.airportCount) throw new RangeError(`airport index ${a} is outside [0, ${model.airportCount})`);
  }
  const fresh = (): { zGroup: number; zOrigin: number; zDest: number } => ({ zGroup: rng.normal(), zOrigin: rng.normal(), zDest: rng.normal() });
  const loc = model.hierarchyValue(theta, 'location', -1, ref.origin, ref.destination, fresh());
  const ls = model.hierarchyValue(theta, 'logScale', -1, ref.origin, ref.destination, fresh());
  const lw = model.mixture ? model.hierarchyValue(theta, 'logitWeight', -1, ref.origin, ref.destination, fresh()) : 0;
  return model.constrain(theta, loc, ls, lw);
}

/** The route's delay distribution under one posterior draw θ (see routeParameters). */
export function routePredictive(model: HierarchicalDelayModel, theta: Float64Array, ref: RouteRef, rng?: Rng): DelayDistribution {
  return parametersDistribution(routeParameters(model, theta, ref, rng));
}
