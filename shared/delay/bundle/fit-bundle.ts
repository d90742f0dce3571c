// Fits a tail-mixture route model to flights and turns the fit into a bundle.
//
// The mode comes from the inference engine's MAP (L-BFGS), with the route sds set by
// Laplace-EM between MAP phases (a joint MAP shrinks them without end). Uncertainty is a block Laplace
// approximation: each route's parameters get the full k x k covariance of their conditional
// posterior at the mode (Hessian by central differences of the route's own gradient), the
// airport effects their closed-form conditional Gaussian, the month-effect sd and the
// degrees of freedom a one-dimensional Laplace approximation on the log scale.
import { fitMap } from '../../inference/map';
import type { CancelSignal, FitDiagnostics, FitOptions, FitProgress, FitResult } from '../../inference/fit-types';
import { createRng } from '../../inference/rng';
import { CLEANING_RULE, type FlightColumns } from '../evaluation/flight-columns';
import { compressDelays, indexRoutes, type PeriodWeightedData, type RouteIndex } from '../evaluation/weighted-delays';
import { createTailMixtureModel, FAMILY_PARAMETERS, type TailFamily, type TailMixtureData, type TailMixtureModel } from '../models/tail-mixture';
import { routeLaplace, routeSdCoordinates, routeSdEmUpdate, warmStart } from '../models/tail-mixture-blocks';
import type { Model } from '../../inference/model';
import { BUNDLE_FORMAT, BUNDLE_VERSION, type PosteriorBundle } from './bundle-schema';

export interface Candidate {
  /** Short name used in tables, e.g. 'gumbel-t+month'. */
  readonly name: string;
  readonly family: TailFamily;
  /** Family parameter indices that get a calendar-month random effect. */
  readonly monthEffects: readonly number[];
  readonly description: string;
}

/**
 * Brueckner, Czerny & Gaggero (2021), "Airline mitigation of propagated delays via schedule
 * buffers: Theory and empirics", Transportation Research Part E 150: schedules carry a flight
 * buffer that recovers on average 6.1 minutes of a departure delay en route.
 */
export const EN_ROUTE_RECOVERY_MINUTES = 6.1;
export const DEPARTURE_ASSUMPTION =
  'Departure delays are not in the sample. A departure delay is derived as the route\'s arrival delay plus ' +
  `${EN_ROUTE_RECOVERY_MINUTES} minutes: the mean en-route recovery that scheduled flight buffers provide ` +
  '(Brueckner, Czerny & Gaggero 2021). The recovery is taken as a constant shift, the same for every flight and delay size.';
export const DEPARTURE_REFERENCE =
  'Brueckner, J. K., Czerny, A. I., Gaggero, A. A. (2021). Airline mitigation of propagated delays via schedule buffers: theory and empirics. Transportation Research Part E 150, 102333.';

export interface FitBundleOptions {
  readonly seed: number;
  readonly maxIterations?: number;
  readonly tolerance?: number;
  readonly onProgress?: (p: FitProgress) => void;
  readonly signal?: CancelSignal;
  readonly drawCount?: number;
  /**
   * Laplace-EM updates of the route sds between MAP phases (default 3; 0 fits every
   * coordinate jointly by MAP). See routeSdEmUpdate.
   */
  readonly routeSdEmRounds?: number;
  /** Block-coordinate sweeps before the fit (default 2, 1 after warmFrom; 0 starts from the prior means or warmFrom). */
  readonly warmStartSweeps?: number;
  /**
   * An earlier fit of the same candidate on overlapping data (e.g. all but the last month) to
   * start from: its coordinates are matched by route, airport and month, so routes, airports
   * or months it did not have start where the sweeps put them.
   */
  readonly warmFrom?: FittedBundle;
  /**
   * Another algorithm than MAP to place the approximation (issue 7: `layline fit --method`).
   * It gets the model's input too, e.g. to build minibatch gradients.
   */
  readonly algorithm?: {
    readonly description: string;
    fit(model: TailMixtureModel, options: FitOptions, input: TailMixtureData): Promise<FitResult>;
  };
  /** Everything in the bundle's metadata the fit itself does not know. */
  readonly metadata: {
    readonly id: string;
    readonly title: string;
    readonly source: string;
    readonly license: string;
    readonly dateRange: { readonly first: string; readonly last: string };
    readonly createdAt: string;
    readonly selection?: string;
    readonly comparison?: PosteriorBundle['metadata']['comparison'];
    readonly notes?: readonly string[];
  };
}

export interface FittedBundle {
  readonly bundle: PosteriorBundle;
  readonly model: TailMixtureModel;
  readonly theta: Float64Array;
  readonly data: PeriodWeightedData;
  readonly index: RouteIndex;
  readonly fitMs: number;
}

/** 1-D Laplace sd of natural coordinate i of the log density at the mode (central second difference). */
function coordinateLaplaceSd(model: TailMixtureModel, theta: Float64Array, i: number): number {
  const grad = new Float64Array(model.dim);
  const h = 1e-3;
  const x = theta.slice();
  x[i] = theta[i]! + h;
  model.naturalLogDensityGrad(x, grad);
  const gPlus = grad[i]!;
  x[i] = theta[i]! - h;
  model.naturalLogDensityGrad(x, grad);
  const gMinus = grad[i]!;
  const curvature = -(gPlus - gMinus) / (2 * h);
  return curvature > 0 ? 1 / Math.sqrt(curvature) : 1;
}

const SIGNIFICANT = 7;
function round(x: number): number {
  return Number(x.toPrecision(SIGNIFICANT));
}

/**
 * MAP of everything but the route sds, alternated with Laplace-EM updates of those sds.
 *
 * Each MAP phase holds the route sds fixed (their gradient is zeroed, so L-BFGS never moves
 * them); between phases routeSdEmUpdate sets them from the route parameters and their
 * Laplace variances. The iteration cap is the total over all phases: the first phase
 * gets what the later ones leave, each later one a fifth of the cap.
 */
async function fitMapWithHierarchyEm(model: TailMixtureModel, options: FitOptions, rounds: number, originOf: Int32Array, destinationOf: Int32Array): Promise<FitResult> {
  const frozen = routeSdCoordinates(model);
  const held: Model = {
    dim: model.dim,
    names: model.names,
    logDensityGrad(theta, grad) {
      const lp = model.logDensityGrad(theta, grad);
      for (let i = 0; i < frozen.length; i++) grad[frozen[i]!] = 0;
      return lp;
    },
  };
  const total = options.maxIterations ?? 3000;
  const later = Math.max(1, Math.floor(total / 5));
  const phases = Math.min(rounds, Math.max(0, Math.floor((total - 1) / later)));
  let init = options.init!;
  let iterations = 0;
  let elapsedMs = 0;
  let sdChange = 0;
  for (let phase = 0; ; phase++) {
    const cap = phase === 0 ? total - phases * later : later;
    const done = iterations;
    const onProgress = options.onProgress;
    const fit = await fitMap(held, {
      ...options,
      init,
      maxIterations: cap,
      // One progress scale over all phases, so a progress bar does not restart at each phase.
      onProgress:
        onProgress &&
        ((p) => onProgress({ ...p, iteration: done + p.iteration, fraction: phase === phases && p.fraction >= 1 ? 1 : Math.min(0.999, (done + p.iteration) / total) })),
    });
    iterations += fit.iterations;
    elapsedMs += fit.elapsedMs;
    if (phase === phases) {
      return { ...fit, iterations, elapsedMs, diagnostics: { ...fit.diagnostics, routeSdEmRounds: phases, lastRouteLogSdChange: sdChange } };
    }
    const natural = model.toNatural(fit.mean);
    sdChange = routeSdEmUpdate(model, natural, originOf, destinationOf);
    init = model.fromNatural(natural);
  }
}

/** Each coordinate's name with route and airport numbers replaced by what they stand for ("mu[route ORD-ATL]"). */
function coordinateIdentities(model: TailMixtureModel, index: RouteIndex, codes: readonly string[]): string[] {
  return model.names.map((name) =>
    name
      .replace(/\[route (\d+)\]/, (_, r: string) => `[route ${index.routes[Number(r)]!.origin}-${index.routes[Number(r)]!.destination}]`)
      .replace(/\[(origin|destination) (\d+)\]/, (_, side: string, a: string) => `[${side} ${codes[Number(a)]}]`),
  );
}

/** Copies the earlier fit's natural coordinates onto the ones of the same identity. */
function overlayEarlierFit(natural: Float64Array, identities: readonly string[], earlier: FittedBundle): void {
  const earlierCodes = [...new Set(earlier.index.routes.flatMap((r) => [r.origin, r.destination]))].sort();
  const earlierIds = coordinateIdentities(earlier.model, earlier.index, earlierCodes);
  const value = new Map(earlierIds.map((id, i) => [id, earlier.theta[i]!]));
  identities.forEach((id, i) => {
    const v = value.get(id);
    if (v !== undefined && Number.isFinite(v)) natural[i] = v;
  });
}

/** Fits the candidate to the masked flights and returns the bundle with its fit. */
export async function fitBundle(flights: FlightColumns, mask: Uint8Array, candidate: Candidate, options: FitBundleOptions): Promise<FittedBundle> {
  const started = Date.now();
  const index = indexRoutes(flights, mask);
  const data = compressDelays(flights, index, mask, { minDelay: CLEANING_RULE.minDelayMinutes, maxDelay: CLEANING_RULE.maxDelayMinutesExclusive - 1 });
  const codes = [...new Set(index.routes.flatMap((r) => [r.origin, r.destination]))].sort();
  const codeIndex = new Map(codes.map((c, i) => [c, i]));
  const originOf = Int32Array.from(index.routes, (r) => codeIndex.get(r.origin)!);
  const destinationOf = Int32Array.from(index.routes, (r) => codeIndex.get(r.destination)!);
  const input: TailMixtureData = { data, airportCount: codes.length, originOf, destinationOf };
  const model = createTailMixtureModel(candidate.family, input, candidate.monthEffects);
  const start = new Float64Array(model.dim);
  model.initialPoint!(start);
  const natural0 = model.toNatural(start);
  const warmStarted = Date.now();
  if (options.warmFrom) overlayEarlierFit(natural0, coordinateIdentities(model, index, codes), options.warmFrom);
  warmStart(model, natural0, originOf, destinationOf, options.warmStartSweeps ?? (options.warmFrom ? 1 : 2));
  const warmStartMs = Date.now() - warmStarted;
  const fitOptions: FitOptions = {
    init: model.fromNatural(natural0),
    rng: createRng(options.seed),
    maxIterations: options.maxIterations ?? 3000,
    // Predicted gain of another step, in nats of a log density of order 1e7: 0.05 is far below any change a score would show.
    tolerance: options.tolerance ?? 0.05,
    onProgress: options.onProgress,
    signal: options.signal,
  };
  const rounds = options.routeSdEmRounds ?? 3;
  const fit = options.algorithm
    ? await options.algorithm.fit(model, fitOptions, input)
    : rounds > 0
      ? await fitMapWithHierarchyEm(model, fitOptions, rounds, originOf, destinationOf)
      : await fitMap(model, fitOptions);
  const theta = model.toNatural(fit.mean);
  const L = model.layout;
  const k = L.k;
  const m = L.monthEffects.length;

  let maxRidge = 0;
  const rows: number[][] = index.routes.map((route, r) => {
    const { mean, chol, ridge } = routeLaplace(model, theta, r);
    maxRidge = Math.max(maxRidge, ridge);
    const row = [originOf[r]!, destinationOf[r]!, route.flights, ...Array.from(mean, round)];
    for (let i = 0; i < k; i++) for (let j = 0; j <= i; j++) row.push(round(chol[i * k + j]!));
    return row;
  });

  // Airport effects given the routes: prior N(0, sdA) times one N(phi_r - pop - B_d, sdR) per route.
  const sdRoute = Array.from({ length: k }, (_, j) => Math.exp(theta[L.logSdRoute + j]!));
  const sdOrigin = Array.from({ length: k }, (_, j) => Math.exp(theta[L.logSdOrigin + j]!));
  const sdDestination = Array.from({ length: k }, (_, j) => Math.exp(theta[L.logSdDestination + j]!));
  const routesFrom = new Float64Array(codes.length);
  const routesTo = new Float64Array(codes.length);
  for (let r = 0; r < index.routes.length; r++) {
    routesFrom[originOf[r]!]! += 1;
    routesTo[destinationOf[r]!]! += 1;
  }
  // Airport and month coordinates are non-centred (standard normal times their sd).
  const effect = (offset: number, sds: readonly number[], a: number) => Array.from({ length: k }, (_, j) => round(sds[j]! * theta[offset + a * k + j]!));
  const effectSd = (count: number, prior: readonly number[]) =>
    Array.from({ length: k }, (_, j) => round(1 / Math.sqrt(1 / prior[j]! ** 2 + count / sdRoute[j]! ** 2)));

  // A new month's effect about the average of the P fitted months has sd tau * sqrt(1 + 1/P).
  const newMonthInflation = L.periods > 0 ? 0.5 * Math.log(1 + 1 / L.periods) : 0;
  const monthLogSd = L.monthEffects.map((_, slot) => ({
    mean: round(theta[L.logTau + slot]! + newMonthInflation),
    sd: round(coordinateLaplaceSd(model, theta, L.logTau + slot)),
  }));
  const monthMeans = L.monthEffects.map((_, slot) => {
    let sum = 0;
    for (let q = 0; q < L.periods; q++) sum += theta[L.delta + q * m + slot]!;
    return sum / Math.max(L.periods, 1);
  });
  const logDf = L.logDf >= 0 ? { mean: round(theta[L.logDf]!), sd: round(coordinateLaplaceSd(model, theta, L.logDf)) } : null;
  const fitMs = Date.now() - started;

  const diagnostics: FitDiagnostics = {
    ...fit.diagnostics,
    iterations: fit.iterations,
    warmStartMs,
    mapMs: fit.elapsedMs,
    converged: fit.converged,
    logPosterior: round(fit.objective),
    triples: data.group.length,
    dimension: model.dim,
    maxLaplaceRidge: maxRidge,
    ...(logDf ? { degreesOfFreedom: round(Math.exp(logDf.mean)) } : {}),
  };
  const bundle: PosteriorBundle = {
    format: BUNDLE_FORMAT,
    version: BUNDLE_VERSION,
    id: options.metadata.id,
    metadata: {
      title: options.metadata.title,
      source: options.metadata.source,
      license: options.metadata.license,
      dateRange: { ...options.metadata.dateRange },
      flights: data.flights,
      routes: index.routes.length,
      airports: codes.length,
      model: `${candidate.name}: ${candidate.description}`,
      method: `${options.algorithm ? `${options.algorithm.description} for the centre` : rounds > 0 ? `MAP by L-BFGS (shared/inference/map.ts) with the route sds set by ${diagnostics.routeSdEmRounds} Laplace-EM updates between MAP phases` : 'MAP by L-BFGS (shared/inference/map.ts)'}, then a block Laplace approximation: full covariance per route, conditional Gaussians for airport effects, 1-D Laplace for log sd of month effects and log df`,
      fitMs,
      createdAt: options.metadata.createdAt,
      cleaning: CLEANING_RULE.text,
      diagnostics,
      selection: options.metadata.selection ?? '',
      comparison: options.metadata.comparison ? [...options.metadata.comparison] : [],
      notes: options.metadata.notes ? [...options.metadata.notes] : [],
    },
    model: { family: candidate.family, parameters: [...FAMILY_PARAMETERS[candidate.family]], monthEffects: [...L.monthEffects] },
    population: {
      mean: Array.from({ length: k }, (_, j) => round(theta[L.pop + j]!)),
      routeSd: sdRoute.map(round),
      originSd: sdOrigin.map(round),
      destinationSd: sdDestination.map(round),
      monthLogSd,
      logDf,
    },
    airports: {
      codes,
      originMean: codes.map((_, a) => effect(L.origin, sdOrigin, a)),
      originSd: codes.map((_, a) => effectSd(routesFrom[a]!, sdOrigin)),
      destinationMean: codes.map((_, a) => effect(L.destination, sdDestination, a)),
      destinationSd: codes.map((_, a) => effectSd(routesTo[a]!, sdDestination)),
    },
    months: {
      labels: m ? [...data.periodLabels] : [],
      effects: m ? data.periodLabels.map((_, q) => Array.from({ length: m }, (_, slot) => round(Math.exp(theta[L.logTau + slot]!) * (theta[L.delta + q * m + slot]! - monthMeans[slot]!)))) : [],
    },
    routes: { rows },
    departure: { derived: true, offsetMinutes: EN_ROUTE_RECOVERY_MINUTES, assumption: DEPARTURE_ASSUMPTION, reference: DEPARTURE_REFERENCE },
    draws: { count: options.drawCount ?? 200, seed: options.seed },
  };
  return { bundle, model, theta, data, index, fitMs };
}
