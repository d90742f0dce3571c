// The route delay models compared for the bundled posteriors: one Gumbel per route, a
// typical-plus-disrupted Gumbel mixture, and a Gumbel plus heavy-tailed Student-t mixture,
// all pooled hierarchically (route toward origin and destination effects toward population
// values) with optional calendar-month random effects.
//
// Each route's parameter vector phi_r ~ N(pop + A_origin + B_dest, sigma_route), with
// A = sigma_origin * a, B = sigma_dest * b, a, b ~ N(0, 1), and month effects likewise
// delta_q = tau * (d_q - mean d): centred over the fitted months, so the route parameters are
// those of the average month and a new month's effect is drawn around it. Routes are centred: thousands of flights pin each phi_r, and its
// conditional posterior is what the bundle's block Laplace approximation uses. Airport and
// month effects are non-centred: in the centred form the joint mode runs off to sd -> 0
// (the density grows like sd^-n as all effects shrink together), which MAP must avoid.
import type { Model } from '../../inference/model';
import { digamma, logGamma } from './student-t';
import type { PeriodWeightedData } from '../evaluation/weighted-delays';

/**
 * 'gumbel': [mu, log beta]. 'gumbel-gumbel': typical Gumbel [mu, log beta], disrupted Gumbel
 * [mu2, log beta2], [logit w]. 'gumbel-t': typical Gumbel, disrupted Student-t [m, log s],
 * [logit w], with a population degrees-of-freedom parameter. 'gumbel-lomax': typical Gumbel,
 * disrupted Lomax (Pareto type II) on delays from LOMAX_START_MINUTES [log lambda, log alpha], [logit w]: a
 * positive delay with a power-law tail S(x) = (1 + x/lambda)^-alpha whose tail index alpha
 * is a route parameter like the others. 'gumbel-gumbel-lomax': the typical and disrupted
 * Gumbels of 'gumbel-gumbel' plus a severe Lomax component [log lambda, log alpha] taking a
 * share v of the non-typical weight [logit v]: weights 1 - w, w (1 - v) and w v.
 */
export type TailFamily = 'gumbel' | 'gumbel-gumbel' | 'gumbel-t' | 'gumbel-lomax' | 'gumbel-gumbel-lomax';

/**
 * Where the Lomax component's support starts: the lower edge of the 0-minute record, since a
 * whole-minute record k stands for [k - 0.5, k + 0.5). Starting at 0 itself would let the
 * density's finite peak at its start grow without bound on the many flights recorded at
 * exactly 0, a degenerate fit of a continuous density to whole-minute data.
 */
export const LOMAX_START_MINUTES = -0.5;

export const FAMILY_PARAMETERS: Readonly<Record<TailFamily, readonly string[]>> = {
  gumbel: ['mu', 'log_beta'],
  'gumbel-gumbel': ['mu', 'log_beta', 'mu_disrupted', 'log_beta_disrupted', 'logit_w'],
  'gumbel-t': ['mu', 'log_beta', 'm_disrupted', 'log_s_disrupted', 'logit_w'],
  'gumbel-lomax': ['mu', 'log_beta', 'log_lambda_disrupted', 'log_alpha_disrupted', 'logit_w'],
  'gumbel-gumbel-lomax': ['mu', 'log_beta', 'mu_disrupted', 'log_beta_disrupted', 'logit_w', 'log_lambda_severe', 'log_alpha_severe', 'logit_v_severe'],
};

/** Per-parameter starting values and (weak) population prior: N(init, priorSd). */
const FAMILY_INIT: Readonly<Record<TailFamily, readonly number[]>> = {
  gumbel: [-2, Math.log(15)],
  'gumbel-gumbel': [-6, Math.log(9), 15, Math.log(35), -1.3],
  'gumbel-t': [-6, Math.log(9), 25, Math.log(25), -1.3],
  'gumbel-lomax': [-6, Math.log(9), Math.log(30), Math.log(2.5), -1.3],
  'gumbel-gumbel-lomax': [-6, Math.log(9), 15, Math.log(35), -1.3, Math.log(60), Math.log(3), -1.5],
};
const POP_PRIOR_SD: Readonly<Record<TailFamily, readonly number[]>> = {
  gumbel: [60, 2],
  'gumbel-gumbel': [60, 2, 100, 2, 3],
  'gumbel-t': [60, 2, 100, 2, 3],
  'gumbel-lomax': [60, 2, 2, 2, 3],
  'gumbel-gumbel-lomax': [60, 2, 100, 2, 3, 2, 2, 3],
};
/**
 * Starting sds of route and airport effects: wide, so the first steps let routes move away
 * from the population (a start that is too tight makes block updates shrink every route
 * onto the population and the sds toward zero).
 */
const FAMILY_INIT_SD: Readonly<Record<TailFamily, readonly number[]>> = {
  gumbel: [10, 0.5],
  'gumbel-gumbel': [10, 0.5, 20, 0.7, 1],
  'gumbel-t': [10, 0.5, 20, 0.7, 1],
  'gumbel-lomax': [10, 0.5, 0.7, 0.5, 1],
  'gumbel-gumbel-lomax': [10, 0.5, 20, 0.7, 1, 0.7, 0.5, 1],
};
/** log sd hyperparameters ~ N(LOG_SD_PRIOR_MEAN, LOG_SD_PRIOR_SD): weak, on the log scale. */
const LOG_SD_PRIOR_MEAN = -1;
const LOG_SD_PRIOR_SD = 2;
/** Student-t degrees of freedom: log df ~ N(log 4, 1). */
const LOG_DF_PRIOR_MEAN = Math.log(4);
const LOG_DF_PRIOR_SD = 1;

export interface TailMixtureData {
  readonly data: PeriodWeightedData;
  readonly airportCount: number;
  /** Origin and destination airport index of each route (group). */
  readonly originOf: Int32Array;
  readonly destinationOf: Int32Array;
}

export interface TailMixtureLayout {
  readonly family: TailFamily;
  readonly k: number;
  readonly routes: number;
  readonly airports: number;
  readonly periods: number;
  /** Indices (into the family's parameters) that get a month random effect. */
  readonly monthEffects: readonly number[];
  readonly phi: number;
  readonly origin: number;
  readonly destination: number;
  readonly delta: number;
  readonly pop: number;
  readonly logSdRoute: number;
  readonly logSdOrigin: number;
  readonly logSdDestination: number;
  readonly logTau: number;
  /** Offset of log df, or -1 without a Student-t component. */
  readonly logDf: number;
  readonly dim: number;
}

export function tailMixtureLayout(family: TailFamily, routes: number, airports: number, periods: number, monthEffects: readonly number[]): TailMixtureLayout {
  const k = FAMILY_PARAMETERS[family].length;
  for (const j of monthEffects) if (!(j >= 0 && j < k)) throw new RangeError(`month effect index ${j} is outside the ${family} parameters`);
  const m = periods > 0 ? monthEffects.length : 0;
  const phi = 0;
  const origin = phi + routes * k;
  const destination = origin + airports * k;
  const delta = destination + airports * k;
  const pop = delta + periods * m;
  const logSdRoute = pop + k;
  const logSdOrigin = logSdRoute + k;
  const logSdDestination = logSdOrigin + k;
  const logTau = logSdDestination + k;
  const logDf = family === 'gumbel-t' ? logTau + m : -1;
  const dim = logTau + m + (family === 'gumbel-t' ? 1 : 0);
  return { family, k, routes, airports, periods, monthEffects: m ? monthEffects : [], phi, origin, destination, delta, pop, logSdRoute, logSdOrigin, logSdDestination, logTau, logDf, dim };
}

const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);

/** Adds log N(x | mean, exp(logSd)) and its gradient (dx, dmean, dlogSd) to out. */
function normalTerm(x: number, mean: number, logSd: number, out: Float64Array): number {
  const sd = Math.exp(logSd);
  const z = (x - mean) / sd;
  out[0] = -z / sd;
  out[1] = z / sd;
  out[2] = z * z - 1;
  return -HALF_LOG_2PI - logSd - 0.5 * z * z;
}

/**
 * Per-flight log density of one delay under parameters eta (length k), writing d/d eta into
 * grad (length k) and d/d log df into gradDf[0]. Shared by the model and by tests.
 */
export function flightLogDensity(family: TailFamily, x: number, eta: Float64Array, df: number, grad: Float64Array, gradDf: Float64Array): number {
  const mu = eta[0]!;
  const beta = Math.exp(eta[1]!);
  const z = (x - mu) / beta;
  const ez = Math.exp(-z);
  const l1 = -eta[1]! - z - ez;
  const d1mu = (1 - ez) / beta;
  const d1b = -1 + z * (1 - ez);
  if (family === 'gumbel') {
    grad[0] = d1mu;
    grad[1] = d1b;
    gradDf[0] = 0;
    return l1;
  }
  const w = 1 / (1 + Math.exp(-eta[4]!));
  if (family === 'gumbel-gumbel-lomax') return threeComponentLogDensity(x, eta, l1, d1mu, d1b, w, grad, gradDf);
  let l2: number;
  let d2a: number;
  let d2b: number;
  let d2df = 0;
  if (family === 'gumbel-gumbel') {
    const beta2 = Math.exp(eta[3]!);
    const z2 = (x - eta[2]!) / beta2;
    const ez2 = Math.exp(-z2);
    l2 = -eta[3]! - z2 - ez2;
    d2a = (1 - ez2) / beta2;
    d2b = -1 + z2 * (1 - ez2);
  } else if (family === 'gumbel-lomax') {
    const lambda = Math.exp(eta[2]!);
    const alpha = Math.exp(eta[3]!);
    if (x < LOMAX_START_MINUTES) {
      l2 = -Infinity;
      d2a = 0;
      d2b = 0;
    } else {
      const v = (x - LOMAX_START_MINUTES) / lambda;
      const lg = Math.log1p(v);
      l2 = eta[3]! - eta[2]! - (alpha + 1) * lg;
      d2a = -1 + ((alpha + 1) * v) / (1 + v);
      d2b = 1 - alpha * lg;
    }
  } else {
    const s = Math.exp(eta[3]!);
    const u = (x - eta[2]!) / s;
    const u2 = u * u;
    const q = df + u2;
    const log1 = Math.log1p(u2 / df);
    l2 = logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - eta[3]! - ((df + 1) / 2) * log1;
    d2a = ((df + 1) * u) / (s * q);
    d2b = -1 + ((df + 1) * u2) / q;
    // d l2 / d df, times df for the log-df chain rule.
    d2df = df * 0.5 * (digamma((df + 1) / 2) - digamma(df / 2) - 1 / df - log1 + ((df + 1) * u2) / (df * q));
  }
  const a1 = Math.log1p(-w) + l1;
  const a2 = Math.log(w) + l2;
  const top = Math.max(a1, a2);
  const lp = a2 === -Infinity ? a1 : top + Math.log(Math.exp(a1 - top) + Math.exp(a2 - top));
  const r2 = a2 === -Infinity ? 0 : Math.exp(a2 - lp);
  const r1 = 1 - r2;
  grad[0] = r1 > 0 ? r1 * d1mu : 0;
  grad[1] = r1 > 0 ? r1 * d1b : 0;
  grad[2] = r2 > 0 ? r2 * d2a : 0;
  grad[3] = r2 > 0 ? r2 * d2b : 0;
  grad[4] = r2 - w;
  gradDf[0] = r2 > 0 ? r2 * d2df : 0;
  return lp;
}

/**
 * The model's coordinates are the natural parameters (minutes, log scales, logits) each
 * multiplied by a fixed scale of the order of the square root of its Fisher information
 * (e.g. sqrt(flights of the route) / beta for a route's location). That linear change of
 * variables has a constant Jacobian, so it moves no mode and changes no posterior, but it
 * makes the curvature of routes with 10 and with 30,000 flights alike, which L-BFGS and
 * ADVI need to converge in hundreds rather than many thousands of steps.
 */
/** Lomax log density at x (support from LOMAX_START_MINUTES) and its derivatives in log lambda and log alpha. */
function lomaxTerms(x: number, logLambda: number, logAlpha: number): { l: number; dLogLambda: number; dLogAlpha: number } {
  if (x < LOMAX_START_MINUTES) return { l: -Infinity, dLogLambda: 0, dLogAlpha: 0 };
  const alpha = Math.exp(logAlpha);
  const v = (x - LOMAX_START_MINUTES) / Math.exp(logLambda);
  const lg = Math.log1p(v);
  return { l: logAlpha - logLambda - (alpha + 1) * lg, dLogLambda: -1 + (alpha + 1) * (v / (1 + v)), dLogAlpha: 1 - alpha * lg };
}

/** The three-component reference density (typical Gumbel, disrupted Gumbel, severe Lomax). */
function threeComponentLogDensity(x: number, eta: Float64Array, l1: number, d1mu: number, d1b: number, w: number, grad: Float64Array, gradDf: Float64Array): number {
  const v = 1 / (1 + Math.exp(-eta[7]!));
  const beta2 = Math.exp(eta[3]!);
  const z2 = (x - eta[2]!) / beta2;
  const ez2 = Math.exp(-z2);
  const l2 = -eta[3]! - z2 - ez2;
  const sev = lomaxTerms(x, eta[5]!, eta[6]!);
  const a = [Math.log1p(-w) + l1, Math.log(w) + Math.log1p(-v) + l2, Math.log(w) + Math.log(v) + sev.l];
  const top = Math.max(...a);
  const e = a.map((ai) => (ai === -Infinity ? 0 : Math.exp(ai - top)));
  const sum = e[0]! + e[1]! + e[2]!;
  const [r1, r2, r3] = e.map((ei) => ei / sum) as [number, number, number];
  grad[0] = r1 > 0 ? r1 * d1mu : 0;
  grad[1] = r1 > 0 ? r1 * d1b : 0;
  grad[2] = r2 > 0 ? (r2 * (1 - ez2)) / beta2 : 0;
  grad[3] = r2 > 0 ? r2 * (-1 + z2 * (1 - ez2)) : 0;
  grad[4] = r2 + r3 - w;
  grad[5] = r3 > 0 ? r3 * sev.dLogLambda : 0;
  grad[6] = r3 > 0 ? r3 * sev.dLogAlpha : 0;
  grad[7] = r3 - v * (r2 + r3);
  gradDf[0] = 0;
  return top + Math.log(sum);
}

export interface TailMixtureModel extends Model {
  readonly layout: TailMixtureLayout;
  /** The coordinate scales: theta = natural * scale. */
  readonly scale: Float64Array;
  toNatural(theta: Float64Array): Float64Array;
  fromNatural(natural: Float64Array): Float64Array;
  /** The log density and its gradient in natural parameters. */
  naturalLogDensityGrad(natural: Float64Array, grad: Float64Array): number;
  /** Log density in route r's natural parameters alone (its flights plus its prior), the rest of `natural` held fixed. */
  routeBlockLogDensityGrad(natural: Float64Array, route: number, phi: Float64Array, grad: Float64Array): number;
}

/** Rough per-flight Fisher information square roots of each family parameter, for the coordinate scales. */
const FISHER_SCALE: Readonly<Record<TailFamily, readonly number[]>> = {
  gumbel: [1 / 15, 1.3],
  'gumbel-gumbel': [0.1, 1.2, 0.02, 0.45, 0.4],
  'gumbel-t': [0.1, 1.2, 0.015, 0.45, 0.4],
  'gumbel-lomax': [0.1, 1.2, 0.3, 0.3, 0.4],
  'gumbel-gumbel-lomax': [0.1, 1.2, 0.02, 0.45, 0.4, 0.2, 0.2, 0.3],
};
/** Rough 1 / sd_route per family parameter, for the scales of airport and population coordinates. */
const POOL_SCALE: Readonly<Record<TailFamily, readonly number[]>> = {
  gumbel: [0.3, 5],
  'gumbel-gumbel': [0.3, 5, 0.1, 3, 2],
  'gumbel-t': [0.3, 5, 0.1, 3, 2],
  'gumbel-lomax': [0.3, 5, 2, 2, 2],
  'gumbel-gumbel-lomax': [0.3, 5, 0.1, 3, 2, 2, 2, 2],
};

/** Builds the model over weighted (route, month, minute, count) data. */
export function createTailMixtureModel(family: TailFamily, input: TailMixtureData, monthEffects: readonly number[] = []): TailMixtureModel {
  const { data } = input;
  const layout = tailMixtureLayout(family, data.groupCount, input.airportCount, monthEffects.length ? data.periodCount : 0, monthEffects);
  const { k } = layout;
  const m = layout.monthEffects.length;
  const names: string[] = [];
  const params = FAMILY_PARAMETERS[family];
  for (let r = 0; r < layout.routes; r++) for (const p of params) names.push(`${p}[route ${r}]`);
  for (let a = 0; a < layout.airports; a++) for (const p of params) names.push(`${p}[origin ${a}]`);
  for (let a = 0; a < layout.airports; a++) for (const p of params) names.push(`${p}[destination ${a}]`);
  for (let q = 0; q < layout.periods; q++) for (const j of layout.monthEffects) names.push(`${params[j]}[month ${data.periodLabels[q]}]`);
  for (const p of params) names.push(`${p}_pop`);
  for (const p of params) names.push(`log_sd_route_${p}`);
  for (const p of params) names.push(`log_sd_origin_${p}`);
  for (const p of params) names.push(`log_sd_destination_${p}`);
  for (const j of layout.monthEffects) names.push(`log_sd_month_${params[j]}`);
  if (layout.logDf >= 0) names.push('log_df');

  // Where each route's triples start, so a route's block can be evaluated alone.
  const routeStart = new Int32Array(layout.routes + 1);
  for (let i = 0; i < data.group.length; i++) routeStart[data.group[i]! + 1]! += 1;
  for (let r = 0; r < layout.routes; r++) routeStart[r + 1]! += routeStart[r]!;
  for (let i = 1; i < data.group.length; i++) if (data.group[i]! < data.group[i - 1]!) throw new RangeError('triples must be sorted by route');
  // Month-effect slot of each family parameter (-1 when it has none).
  const effectSlot = new Int32Array(k).fill(-1);
  layout.monthEffects.forEach((j, slot) => (effectSlot[j] = slot));

  const eta = new Float64Array(k);
  const runGrad = new Float64Array(k);
  const tau = new Float64Array(Math.max(m, 1));
  const dMean = new Float64Array(Math.max(m, 1));
  const nt = new Float64Array(3);

  /** Mean over months of each month-effect coordinate, into out. */
  function monthEffectMeans(theta: Float64Array, out: Float64Array): void {
    out.fill(0);
    for (let slot = 0; slot < m; slot++) {
      let sum = 0;
      for (let q = 0; q < layout.periods; q++) sum += theta[layout.delta + q * m + slot]!;
      out[slot] = layout.periods ? sum / layout.periods : 0;
    }
  }

  /**
   * Likelihood of triples [from, to). Triples come in runs of one (route, month); everything
   * that depends only on the parameters is computed once per run, so the per-flight work is
   * a handful of exp/log calls. base(r) gives the offset of route r's parameters in `theta`,
   * or -1 to read them from `phiOverride`. Gradients go to grad (route and month slots) or,
   * with phiOverride, to gradPhi.
   */
  function likelihood(theta: Float64Array, from: number, to: number, phiOverride: Float64Array | null, grad: Float64Array | null, gradPhi: Float64Array | null): number {
    const hasT = family === 'gumbel-t';
    const hasLomax = family === 'gumbel-lomax';
    const df = hasT ? Math.exp(theta[layout.logDf]!) : 0;
    // Student-t constants, once per call: the log normaliser and the parts of d/d df that do not depend on x.
    const tConst = hasT ? logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) : 0;
    const tDfConst = hasT ? 0.5 * (digamma((df + 1) / 2) - digamma(df / 2) - 1 / df) : 0;
    monthEffectMeans(theta, dMean);
    for (let slot = 0; slot < m; slot++) tau[slot] = Math.exp(theta[layout.logTau + slot]!);
    let total = 0;
    let gDf = 0;
    let i = from;
    while (i < to) {
      const r = data.group[i]!;
      const q = data.period[i]!;
      let end = i + 1;
      while (end < to && data.group[end] === r && data.period[end] === q) end++;
      const base = layout.phi + r * k;
      for (let j = 0; j < k; j++) {
        let v = phiOverride ? phiOverride[j]! : theta[base + j]!;
        const slot = effectSlot[j]!;
        if (slot >= 0) v += tau[slot]! * (theta[layout.delta + q * m + slot]! - dMean[slot]!);
        eta[j] = v;
      }
      const mu = eta[0]!;
      const logBeta = eta[1]!;
      const invBeta = Math.exp(-logBeta);
      runGrad.fill(0);
      if (family === 'gumbel-gumbel-lomax') {
        const w = 1 / (1 + Math.exp(-eta[4]!));
        const v = 1 / (1 + Math.exp(-eta[7]!));
        const logW1 = Math.log1p(-w);
        const logW2 = Math.log(w) + Math.log1p(-v);
        const logW3 = Math.log(w) + Math.log(v);
        const mu2 = eta[2]!;
        const logBeta2 = eta[3]!;
        const invBeta2 = Math.exp(-logBeta2);
        const logLambda = eta[5]!;
        const invLambda = Math.exp(-logLambda);
        const logAlpha = eta[6]!;
        const alpha = Math.exp(logAlpha);
        for (let t = i; t < end; t++) {
          const n = data.count[t]!;
          const x = data.value[t]!;
          const z = (x - mu) * invBeta;
          const ez = Math.exp(-z);
          const a1 = logW1 - logBeta - z - ez;
          const z2 = (x - mu2) * invBeta2;
          const ez2 = Math.exp(-z2);
          const a2 = logW2 - logBeta2 - z2 - ez2;
          let a3 = -Infinity;
          let u = 0;
          let lg = 0;
          if (x >= LOMAX_START_MINUTES) {
            u = (x - LOMAX_START_MINUTES) * invLambda;
            lg = Math.log1p(u);
            a3 = logW3 + logAlpha - logLambda - (alpha + 1) * lg;
          }
          const top = a1 > a2 ? (a1 > a3 ? a1 : a3) : a2 > a3 ? a2 : a3;
          const e1 = Math.exp(a1 - top);
          const e2 = Math.exp(a2 - top);
          const e3 = a3 > -Infinity ? Math.exp(a3 - top) : 0;
          const sum = e1 + e2 + e3;
          total += n * (top + Math.log(sum));
          const r1 = e1 / sum;
          const r2 = e2 / sum;
          const r3 = e3 / sum;
          if (r1 > 0) {
            runGrad[0]! += n * r1 * (1 - ez) * invBeta;
            runGrad[1]! += n * r1 * (-1 + z * (1 - ez));
          }
          if (r2 > 0) {
            runGrad[2]! += n * r2 * (1 - ez2) * invBeta2;
            runGrad[3]! += n * r2 * (-1 + z2 * (1 - ez2));
          }
          if (r3 > 0) {
            runGrad[5]! += n * r3 * (-1 + (alpha + 1) * (u / (1 + u)));
            runGrad[6]! += n * r3 * (1 - alpha * lg);
          }
          runGrad[4]! += n * (r2 + r3 - w);
          runGrad[7]! += n * (r3 - v * (r2 + r3));
        }
      } else if (family === 'gumbel') {
        for (let t = i; t < end; t++) {
          const n = data.count[t]!;
          const z = (data.value[t]! - mu) * invBeta;
          const ez = Math.exp(-z);
          total += n * (-logBeta - z - ez);
          runGrad[0]! += n * (1 - ez) * invBeta;
          runGrad[1]! += n * (-1 + z * (1 - ez));
        }
      } else {
        const w = 1 / (1 + Math.exp(-eta[4]!));
        const logW = Math.log(w);
        const log1mW = Math.log1p(-w);
        const loc2 = eta[2]!;
        const logScale2 = hasLomax ? eta[2]! : eta[3]!;
        const invScale2 = Math.exp(-logScale2);
        // Lomax: eta[2] is log lambda (the scale, read as logScale2), eta[3] log alpha.
        const logAlpha = eta[3]!;
        const alpha = Math.exp(logAlpha);
        for (let t = i; t < end; t++) {
          const n = data.count[t]!;
          const x = data.value[t]!;
          const z = (x - mu) * invBeta;
          const ez = Math.exp(-z);
          const a1 = log1mW - logBeta - z - ez;
          let a2: number;
          let d2a: number;
          let d2b: number;
          let d2df = 0;
          if (hasLomax) {
            const v = (x - LOMAX_START_MINUTES) * invScale2;
            const lg = Math.log1p(v);
            a2 = logW + logAlpha - logScale2 - (alpha + 1) * lg;
            if (x < LOMAX_START_MINUTES || !(a2 > -Infinity)) {
              // The disrupted component has no mass below its start: the flight is all typical.
              total += n * a1;
              runGrad[0]! += n * (1 - ez) * invBeta;
              runGrad[1]! += n * (-1 + z * (1 - ez));
              runGrad[4]! += n * -w;
              continue;
            }
            d2a = -1 + (alpha + 1) * (v / (1 + v));
            d2b = 1 - alpha * lg;
          } else if (hasT) {
            const u = (x - loc2) * invScale2;
            const u2 = u * u;
            const qd = df + u2;
            const log1 = Math.log1p(u2 / df);
            a2 = logW + tConst - logScale2 - ((df + 1) / 2) * log1;
            d2a = (df + 1) * u * invScale2 / qd;
            d2b = -1 + ((df + 1) * u2) / qd;
            d2df = df * (tDfConst - 0.5 * log1 + (0.5 * (df + 1) * u2) / (df * qd));
          } else {
            const z2 = (x - loc2) * invScale2;
            const ez2 = Math.exp(-z2);
            a2 = logW - logScale2 - z2 - ez2;
            d2a = (1 - ez2) * invScale2;
            d2b = -1 + z2 * (1 - ez2);
          }
          // log(e^a1 + e^a2) and the disrupted component's responsibility, with one exp and one log1p.
          let lp: number;
          let r2: number;
          if (a1 >= a2) {
            const e = Math.exp(a2 - a1);
            lp = a1 + Math.log1p(e);
            r2 = e / (1 + e);
          } else {
            const e = Math.exp(a1 - a2);
            lp = a2 + Math.log1p(e);
            r2 = 1 / (1 + e);
          }
          const r1 = 1 - r2;
          total += n * lp;
          // A component with zero responsibility contributes nothing, even where its own
          // derivative overflows (0 * Infinity would poison the gradient with NaN).
          if (r1 > 0) {
            runGrad[0]! += n * r1 * (1 - ez) * invBeta;
            runGrad[1]! += n * r1 * (-1 + z * (1 - ez));
          }
          if (r2 > 0) {
            runGrad[2]! += n * r2 * d2a;
            runGrad[3]! += n * r2 * d2b;
            gDf += n * r2 * d2df;
          }
          runGrad[4]! += n * (r2 - w);
        }
      }
      if (gradPhi) for (let j = 0; j < k; j++) gradPhi[j]! += runGrad[j]!;
      if (grad) {
        if (!phiOverride) for (let j = 0; j < k; j++) grad[base + j]! += runGrad[j]!;
        for (let j = 0; j < k; j++) {
          const slot = effectSlot[j]!;
          if (slot < 0) continue;
          const di = layout.delta + q * m + slot;
          grad[di]! += tau[slot]! * runGrad[j]!;
          grad[layout.logTau + slot]! += tau[slot]! * (theta[di]! - dMean[slot]!) * runGrad[j]!;
        }
      }
      i = end;
    }
    if (grad && hasT) grad[layout.logDf]! += gDf;
    return total;
  }

  function naturalLogDensityGrad(theta: Float64Array, grad: Float64Array): number {
    grad.fill(0);
    let lp = likelihood(theta, 0, data.group.length, null, grad, null);
    // The month effects enter centred, tau * (d_q - mean d), so the likelihood's gradient in d_q
    // is the effect's gradient minus its average over months.
    for (let slot = 0; slot < m; slot++) {
      let g = 0;
      for (let q = 0; q < layout.periods; q++) g += grad[layout.delta + q * m + slot]!;
      g /= layout.periods;
      for (let q = 0; q < layout.periods; q++) grad[layout.delta + q * m + slot]! -= g;
    }
    // Route level: phi_r ~ N(pop + A_o + B_d, sd_route).
    for (let r = 0; r < layout.routes; r++) {
      const o = input.originOf[r]!;
      const d = input.destinationOf[r]!;
      for (let j = 0; j < k; j++) {
        const pi = layout.phi + r * k + j;
        const ai = layout.origin + o * k + j;
        const bi = layout.destination + d * k + j;
        const si = layout.logSdRoute + j;
        const sdA = Math.exp(theta[layout.logSdOrigin + j]!);
        const sdB = Math.exp(theta[layout.logSdDestination + j]!);
        lp += normalTerm(theta[pi]!, theta[layout.pop + j]! + sdA * theta[ai]! + sdB * theta[bi]!, theta[si]!, nt);
        grad[pi]! += nt[0]!;
        grad[layout.pop + j]! += nt[1]!;
        grad[ai]! += nt[1]! * sdA;
        grad[bi]! += nt[1]! * sdB;
        grad[layout.logSdOrigin + j]! += nt[1]! * sdA * theta[ai]!;
        grad[layout.logSdDestination + j]! += nt[1]! * sdB * theta[bi]!;
        grad[si]! += nt[2]!;
      }
    }
    // Non-centred airport and month effects: standard normal coordinates times their sd.
    const standardStart = layout.origin;
    const standardEnd = layout.pop;
    for (let i = standardStart; i < standardEnd; i++) {
      const x = theta[i]!;
      lp -= HALF_LOG_2PI + 0.5 * x * x;
      grad[i]! -= x;
    }
    const init = FAMILY_INIT[family];
    const popSd = POP_PRIOR_SD[family];
    for (let j = 0; j < k; j++) {
      const z = (theta[layout.pop + j]! - init[j]!) / popSd[j]!;
      lp -= 0.5 * z * z;
      grad[layout.pop + j]! -= z / popSd[j]!;
    }
    const hyper = [layout.logSdRoute, layout.logSdOrigin, layout.logSdDestination];
    for (const off of hyper) {
      for (let j = 0; j < k; j++) {
        const z = (theta[off + j]! - LOG_SD_PRIOR_MEAN) / LOG_SD_PRIOR_SD;
        lp -= 0.5 * z * z;
        grad[off + j]! -= z / LOG_SD_PRIOR_SD;
      }
    }
    for (let slot = 0; slot < m; slot++) {
      const z = (theta[layout.logTau + slot]! - LOG_SD_PRIOR_MEAN) / LOG_SD_PRIOR_SD;
      lp -= 0.5 * z * z;
      grad[layout.logTau + slot]! -= z / LOG_SD_PRIOR_SD;
    }
    if (layout.logDf >= 0) {
      const z = (theta[layout.logDf]! - LOG_DF_PRIOR_MEAN) / LOG_DF_PRIOR_SD;
      lp -= 0.5 * z * z;
      grad[layout.logDf]! -= z / LOG_DF_PRIOR_SD;
    }
    return lp;
  }

  function routeBlockLogDensityGrad(theta: Float64Array, route: number, phi: Float64Array, grad: Float64Array): number {
    grad.fill(0);
    let lp = likelihood(theta, routeStart[route]!, routeStart[route + 1]!, phi, null, grad);
    const o = input.originOf[route]!;
    const d = input.destinationOf[route]!;
    for (let j = 0; j < k; j++) {
      const mean =
        theta[layout.pop + j]! +
        Math.exp(theta[layout.logSdOrigin + j]!) * theta[layout.origin + o * k + j]! +
        Math.exp(theta[layout.logSdDestination + j]!) * theta[layout.destination + d * k + j]!;
      lp += normalTerm(phi[j]!, mean, theta[layout.logSdRoute + j]!, nt);
      grad[j]! += nt[0]!;
    }
    return lp;
  }

  function naturalInitialPoint(theta: Float64Array): void {
    theta.fill(0);
    const init = FAMILY_INIT[family];
    for (let r = 0; r < layout.routes; r++) for (let j = 0; j < k; j++) theta[layout.phi + r * k + j] = init[j]!;
    for (let j = 0; j < k; j++) {
      theta[layout.pop + j] = init[j]!;
      const logSd = Math.log(FAMILY_INIT_SD[family][j]!);
      theta[layout.logSdRoute + j] = logSd;
      theta[layout.logSdOrigin + j] = logSd;
      theta[layout.logSdDestination + j] = logSd;
    }
    for (let slot = 0; slot < m; slot++) theta[layout.logTau + slot] = LOG_SD_PRIOR_MEAN;
    if (layout.logDf >= 0) theta[layout.logDf] = Math.log(3);
  }

  const scale = coordinateScales(family, layout, input);
  const natural = new Float64Array(layout.dim);
  const toNatural = (theta: Float64Array): Float64Array => theta.map((x, i) => x / scale[i]!);
  const fromNatural = (nat: Float64Array): Float64Array => nat.map((x, i) => x * scale[i]!);
  function logDensityGrad(theta: Float64Array, grad: Float64Array): number {
    for (let i = 0; i < layout.dim; i++) natural[i] = theta[i]! / scale[i]!;
    const lp = naturalLogDensityGrad(natural, grad);
    for (let i = 0; i < layout.dim; i++) grad[i]! /= scale[i]!;
    return lp;
  }
  function initialPoint(theta: Float64Array): void {
    naturalInitialPoint(theta);
    for (let i = 0; i < layout.dim; i++) theta[i]! *= scale[i]!;
  }
  return { dim: layout.dim, names, logDensityGrad, naturalLogDensityGrad, layout, scale, toNatural, fromNatural, routeBlockLogDensityGrad, initialPoint };
}

function coordinateScales(family: TailFamily, layout: TailMixtureLayout, input: TailMixtureData): Float64Array {
  const { k } = layout;
  const m = layout.monthEffects.length;
  const scale = new Float64Array(layout.dim).fill(1);
  const fisher = FISHER_SCALE[family];
  const pool = POOL_SCALE[family];
  const routeFlights = new Float64Array(layout.routes);
  const periodFlights = new Float64Array(Math.max(layout.periods, 1));
  let total = 0;
  for (let i = 0; i < input.data.group.length; i++) {
    const n = input.data.count[i]!;
    routeFlights[input.data.group[i]!]! += n;
    periodFlights[input.data.period[i]!]! += n;
    total += n;
  }
  const routesFrom = new Float64Array(layout.airports);
  const routesTo = new Float64Array(layout.airports);
  for (let r = 0; r < layout.routes; r++) {
    routesFrom[input.originOf[r]!]! += 1;
    routesTo[input.destinationOf[r]!]! += 1;
  }
  for (let r = 0; r < layout.routes; r++) for (let j = 0; j < k; j++) scale[layout.phi + r * k + j] = fisher[j]! * Math.sqrt(routeFlights[r]! + 1);
  for (let a = 0; a < layout.airports; a++) {
    for (let j = 0; j < k; j++) {
      scale[layout.origin + a * k + j] = 0.5 * Math.sqrt(routesFrom[a]! + 1);
      scale[layout.destination + a * k + j] = 0.5 * Math.sqrt(routesTo[a]! + 1);
    }
  }
  for (let q = 0; q < layout.periods; q++) layout.monthEffects.forEach((j, slot) => (scale[layout.delta + q * m + slot] = 0.3 * fisher[j]! * Math.sqrt(periodFlights[q]! + 1)));
  for (let j = 0; j < k; j++) {
    scale[layout.pop + j] = pool[j]! * Math.sqrt(layout.routes + 1);
    scale[layout.logSdRoute + j] = Math.sqrt(2 * layout.routes + 1);
    scale[layout.logSdOrigin + j] = Math.sqrt(2 * layout.airports + 1);
    scale[layout.logSdDestination + j] = Math.sqrt(2 * layout.airports + 1);
  }
  for (let slot = 0; slot < m; slot++) scale[layout.logTau + slot] = Math.sqrt(2 * layout.periods + 1);
  if (layout.logDf >= 0) scale[layout.logDf] = 0.05 * Math.sqrt(total + 1);
  return scale;
}
